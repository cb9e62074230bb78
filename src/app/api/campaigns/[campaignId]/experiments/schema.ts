export { createExperimentSchema as postBody } from "@/lib/validation/experiments";
