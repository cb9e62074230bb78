/**
 * Everything that makes INVENTED plates: the simulator, the standard layouts, the reader-export
 * writers, the demo campaign and the fixture set. Used by the seed, the fixtures command and the
 * tests; kept out of the production barrel (./index) so the app does not ship it by accident.
 */
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
