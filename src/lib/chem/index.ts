/**
 * The chemistry library (openchemlib underneath): safe in the browser and in Node. The XLSX
 * importer pulls in exceljs and is imported separately from "@/lib/chem/import-xlsx".
 */
export * from "./parse";
export * from "./properties";
export * from "./fingerprint";
export * from "./substructure";
export * from "./svg";
export * from "./validation";
export * from "./import-types";
export * from "./import-fields";
export * from "./import-table";
export * from "./import-sdf";
export * from "./import-prepare";
export * from "./demo-compounds";
export * from "./cautions";
