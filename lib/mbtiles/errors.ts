/** A package that is not a usable MBTiles file; `issues` lists every problem found, one sentence each. */
export class MbtilesError extends Error {
  constructor(
    message: string,
    readonly issues: string[] = [message],
  ) {
    super(message);
    this.name = "MbtilesError";
  }
}
