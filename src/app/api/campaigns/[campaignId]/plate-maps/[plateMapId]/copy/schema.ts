export { PostPlateMapCopyBody } from "../schema";
