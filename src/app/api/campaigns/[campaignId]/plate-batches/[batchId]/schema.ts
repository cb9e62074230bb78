export { PlateBatchResponse as GetPlateBatchResponse } from "../schema";
