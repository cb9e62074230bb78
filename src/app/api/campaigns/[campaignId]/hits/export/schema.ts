export { hitExportSchema as exportQuery } from "@/lib/hits/query";
