export const FEATURE_LABELS: Record<string, string> = {
  bedding: "Bedding",
  foliation: "Foliation",
  cleavage: "Cleavage",
  joint: "Joint",
  fault: "Fault",
  vein: "Vein",
  contact: "Contact",
  dyke: "Dyke",
  lineation: "Lineation",
  fold_hinge: "Fold hinge",
  slickenline: "Slickenline",
  other: "Other",
};
