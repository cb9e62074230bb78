export { importIdParam } from "../schema";
