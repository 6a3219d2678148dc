/** The cautions live in lib/core so every layer uses the same words; re-exported here for the report. */
export { CLINICAL_CAUTION, DRAFT_CAUTION } from "../core/cautions";
