/**
 * File names from uploads are untrusted text shown in the UI and sent back in Content-Disposition. Control characters
 * (C0, DEL, C1) and the Unicode bidirectional formatting characters (Unicode Standard Annex #9, Table 1: LRE, RLE, PDF,
 * LRO, RLO, LRI, RLI, FSI, PDI, LRM, RLM, ALM) are removed — U+202E makes "rtl-\u202Egpj.exe" display as "rtl-exe.jpg"
 * (CVE-class "RTLO spoofing"). Path separators become "_", the result is NFC and at most 200 characters.
 */
const UNSAFE = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\ufeff]/g;

export function cleanFileName(name: string, fallback = "file"): string {
  const cleaned = name
    .normalize("NFC")
    .replace(UNSAFE, "")
    .replace(/[/\\]/g, "_")
    .replace(/^\.+/, "")
    .trim()
    .slice(0, 200);
  return cleaned || fallback;
}

/** RFC 6266 Content-Disposition with an ASCII fallback and the cleaned UTF-8 name in filename*. */
export function contentDisposition(name: string, type: "inline" | "attachment" = "attachment"): string {
  const safe = cleanFileName(name);
  const ascii = safe.replace(/[^\x20-\x7e]|["\\;]/g, "_");
  return `${type}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(safe)}`;
}
