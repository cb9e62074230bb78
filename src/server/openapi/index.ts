import "server-only";
export { buildOpenApiDocument, callersOf, tagOf, type OpenApiDocument } from "./document";
export { apiOperations } from "./operations";
export { registryIdOf, type ApiOperation } from "./types";
