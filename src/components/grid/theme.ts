import { themeQuartz } from "ag-grid-community";

/** The product's AG Grid look (the Tailwind tokens' colours), shared by every grid. */
export const gridTheme = themeQuartz.withParams({
  fontFamily: "inherit",
  fontSize: 13,
  headerFontSize: 12,
  foregroundColor: "#1d2630",
  headerTextColor: "#66737f",
  backgroundColor: "#ffffff",
  headerBackgroundColor: "#f3f1ec",
  borderColor: "#e3e0d8",
  rowHoverColor: "#e3f2ef",
  selectedRowBackgroundColor: "#d7ece8",
  accentColor: "#0f766e",
  wrapperBorderRadius: 6,
  spacing: 5,
});
