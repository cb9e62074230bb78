export { saveViewSchema as postBody } from "@/lib/hits/query";
