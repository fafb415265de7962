/** Suggested descriptive terms (common trade terms: common practice); free text stays allowed. */
export const LITHOLOGY_TERMS = [
  "granite", "granodiorite", "diorite", "gabbro", "rhyolite", "dacite", "andesite", "basalt", "tuff",
  "conglomerate", "sandstone", "siltstone", "mudstone", "shale", "limestone", "dolostone", "chert", "evaporite", "ironstone",
  "slate", "phyllite", "schist", "gneiss", "quartzite", "marble", "amphibolite", "hornfels", "skarn",
  "gossan", "massive sulfide", "jasper", "diabase",
];

export const ALTERATION_TERMS = [
  "potassic", "phyllic (sericitic)", "argillic", "advanced argillic", "propylitic", "silicification", "carbonatization", "hematization", "chloritization",
];

/** <datalist>s the forms refer to by id. */
export function FieldTermLists() {
  return (
    <>
      <datalist id="lithology-terms">
        {LITHOLOGY_TERMS.map((t) => (
          <option key={t} value={t} />
        ))}
      </datalist>
      <datalist id="alteration-terms">
        {ALTERATION_TERMS.map((t) => (
          <option key={t} value={t} />
        ))}
      </datalist>
    </>
  );
}
