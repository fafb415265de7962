/** March–Dollase preferred-orientation factor (Dollase 1986, J. Appl. Cryst. 19, 267). */

/**
 * P(α) = (r²·cos²α + sin²α / r)^(−3/2), α = angle between the scattering vector and the preferred-orientation
 * direction. r = 1: random powder; r < 1: platelets lying flat with the chosen planes parallel to the specimen
 * surface (those lines get stronger); r > 1: needles. Averages to 1 over all directions.
 * @param cosAlpha - cos α
 * @param r - March coefficient (> 0)
 */
export function marchDollase(cosAlpha: number, r: number): number {
  const c2 = cosAlpha * cosAlpha;
  return Math.pow(r * r * c2 + (1 - c2) / r, -1.5);
}
