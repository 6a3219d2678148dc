/**
 * Escape text for an XML text node or attribute value (& < > " ').
 * @example escapeXml('VE/VCO2 < 34 & "x"') → 'VE/VCO2 &lt; 34 &amp; &quot;x&quot;'
 */
export function escapeXml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&apos;");
}
