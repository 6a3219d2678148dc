/** Unit as shown to a reader: dimensionless ratios show no unit; rates per minute read as "/min". */
export function displayUnit(unit: string): string {
  if (unit === "1") return "";
  if (unit === "1/min") return "/min";
  return unit;
}
