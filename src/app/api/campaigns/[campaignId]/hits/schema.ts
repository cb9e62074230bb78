export { hitListSchema as listQuery, bulkTriageSchema as bulkBody } from "@/lib/hits/query";
