// The columns an inventory import understands, for the mapping screen (in the browser) and the
// importer (on the server). Pure: no database, no server-only code.

export type ImportFieldKey =
  | "accountNumber"
  | "siteName"
  | "addressLine1"
  | "addressLine2"
  | "city"
  | "postalCode"
  | "siteHazard"
  | "facilityType"
  | "contactName"
  | "contactPhone"
  | "ownerName"
  | "ownerEmail"
  | "ownerPhone"
  | "ownerAddress"
  | "kind"
  | "make"
  | "model"
  | "size"
  | "serial"
  | "location"
  | "assemblyHazard"
  | "backpressurePossible"
  | "installedOn"
  | "notes";

export interface ImportField {
  key: ImportFieldKey;
  label: string;
  group: "site" | "owner" | "assembly";
  isRequired: boolean;
  hint: string;
  /** Header names that map to this field without asking (compared lower-case, without punctuation). */
  synonyms: string[];
}

export const importFields: ImportField[] = [
  { key: "accountNumber", label: "Account number", group: "site", isRequired: true, hint: "The service account; one site per account. Re-importing matches sites on it.", synonyms: ["account", "account number", "account no", "acct", "acct no", "account id", "service account"] },
  { key: "siteName", label: "Site name", group: "site", isRequired: false, hint: "Needed for a new account.", synonyms: ["site", "site name", "name", "premises", "customer", "business", "facility name"] },
  { key: "addressLine1", label: "Service address", group: "site", isRequired: false, hint: "Needed for a new account.", synonyms: ["address", "service address", "street", "street address", "address 1", "address1", "site address"] },
  { key: "addressLine2", label: "Address line 2", group: "site", isRequired: false, hint: "", synonyms: ["address 2", "address2", "suite", "unit"] },
  { key: "city", label: "Town or city", group: "site", isRequired: false, hint: "Needed for a new account.", synonyms: ["city", "town", "municipality"] },
  { key: "postalCode", label: "Postal code", group: "site", isRequired: false, hint: "", synonyms: ["zip", "zip code", "postal code", "postcode"] },
  { key: "siteHazard", label: "Degree of hazard (site)", group: "site", isRequired: false, hint: "severe, high or low; a new site without one is low.", synonyms: ["hazard", "site hazard", "degree of hazard", "hazard class", "hazard level"] },
  { key: "facilityType", label: "Facility type", group: "site", isRequired: false, hint: "", synonyms: ["facility type", "facility", "premises type", "use", "category", "occupancy"] },
  { key: "contactName", label: "Site contact", group: "site", isRequired: false, hint: "", synonyms: ["contact", "contact name", "site contact"] },
  { key: "contactPhone", label: "Site contact phone", group: "site", isRequired: false, hint: "", synonyms: ["contact phone", "site phone", "phone"] },
  { key: "ownerName", label: "Owner name", group: "owner", isRequired: false, hint: "Linked to the site; matched on e-mail, else on name.", synonyms: ["owner", "owner name", "property owner", "responsible party"] },
  { key: "ownerEmail", label: "Owner e-mail", group: "owner", isRequired: false, hint: "Notices go by e-mail when there is one.", synonyms: ["owner email", "email", "e-mail", "owner e-mail"] },
  { key: "ownerPhone", label: "Owner phone", group: "owner", isRequired: false, hint: "", synonyms: ["owner phone", "owner telephone"] },
  { key: "ownerAddress", label: "Owner mailing address", group: "owner", isRequired: false, hint: "For letters.", synonyms: ["owner address", "mailing address", "billing address"] },
  { key: "kind", label: "Assembly kind", group: "assembly", isRequired: false, hint: "RP, RPDA, DC, DCDA, PVB, SVB or AG (or the full name). Leave the assembly columns empty for a site without one.", synonyms: ["kind", "type", "assembly type", "device type", "assembly kind", "device"] },
  { key: "make", label: "Make", group: "assembly", isRequired: false, hint: "", synonyms: ["make", "manufacturer", "brand", "mfr"] },
  { key: "model", label: "Model", group: "assembly", isRequired: false, hint: "", synonyms: ["model", "model number", "model no"] },
  { key: "size", label: "Size", group: "assembly", isRequired: false, hint: 'e.g. 3/4 in, 2 in', synonyms: ["size", "diameter", "pipe size"] },
  { key: "serial", label: "Serial", group: "assembly", isRequired: false, hint: "Re-importing matches assemblies on make + serial, or on site + location.", synonyms: ["serial", "serial number", "serial no", "sn", "serial #"] },
  { key: "location", label: "Location on site", group: "assembly", isRequired: false, hint: "e.g. meter vault at the street", synonyms: ["location", "assembly location", "device location", "where", "installed location"] },
  { key: "assemblyHazard", label: "Degree of hazard (assembly)", group: "assembly", isRequired: false, hint: "Defaults to the site's.", synonyms: ["assembly hazard", "device hazard"] },
  { key: "backpressurePossible", label: "Backpressure possible", group: "assembly", isRequired: false, hint: "yes or no", synonyms: ["backpressure", "backpressure possible", "back pressure"] },
  { key: "installedOn", label: "Installed on", group: "assembly", isRequired: false, hint: "YYYY-MM-DD or MM/DD/YYYY", synonyms: ["installed", "installed on", "install date", "installation date", "date installed"] },
  { key: "notes", label: "Notes", group: "assembly", isRequired: false, hint: "", synonyms: ["notes", "note", "comments", "remarks"] },
];

export type ImportMapping = Partial<Record<ImportFieldKey, string>>;

/** Header text compared loosely: lower case, punctuation and spacing collapsed. */
export function normalizeHeader(header: string): string {
  return header
    .replace(/^\uFEFF/, "")
    .toLowerCase()
    .replace(/[_\-./#:()]+/g, " ")
    .replace(/\s+/g, " ")
    .trim();
}

/** A first guess at the mapping from the file's header row. */
export function guessMapping(headers: readonly string[]): ImportMapping {
  const mapping: ImportMapping = {};
  const used = new Set<string>();
  for (const field of importFields) {
    const candidates = [normalizeHeader(field.label), ...field.synonyms.map(normalizeHeader)];
    const match = headers.find((h) => !used.has(h) && candidates.includes(normalizeHeader(h)));
    if (match) {
      mapping[field.key] = match;
      used.add(match);
    }
  }
  return mapping;
}

/** Imports take files up to this size (the upload itself allows a little more). */
export const IMPORT_MAX_BYTES = 50 * 1024 * 1024;
export const IMPORT_MAX_ROWS = 300_000;
