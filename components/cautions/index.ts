export { AsbestosCaution, SilicaCaution, CandidatesNotice, HazardCautions, type HazardPhase } from "./cautions";
export { ASBESTOS_CAUTION, SILICA_CAUTION, CANDIDATES_NOTICE, XRAY_EQUIPMENT_NOTE, OTHER_HAZARD_NOTE } from "./caution-texts";
