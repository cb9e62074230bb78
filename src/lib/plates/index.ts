/**
 * Plate library: geometry, plate maps (CSV, editor helpers, validation), reader export parsing
 * and the simulator for invented fixtures. Pure: no database, network or file system.
 */
export * from "./geometry";
export * from "./issues";
export { formulaInjectionMessage, parseNumber } from "./cells";
export * from "./plate-map";
export * from "./editor";
export * from "./reader-export";
export { parseTimeLabel, parseDuration } from "./read-time";
export * from "./simulate";
export * from "./export-writers";
export * from "./layouts";
export {
  demoCampaignPlates,
  compoundId,
  inventedCompounds,
  SPECIAL_COMPOUNDS,
  DEMO_ENZYME,
  DEMO_SUBSTRATE_UM,
  DEMO_NOTE,
  type DemoCampaign,
  type DemoPlate,
  type DemoOptions,
} from "./demo-campaign";
export {
  buildFixtureSet,
  FIXTURE_SEED,
  type FixtureSet,
  type GoodFixture,
  type BadFixture,
  type FixtureFile,
} from "./fixture-set";
