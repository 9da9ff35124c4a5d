// The inventory file checks that run before anything is written: encoding, header against the
// mapping, empty lines, and every row through zod (kinds, hazards, dates, e-mail, duplicates).
import { describe, expect, test } from "vitest";
import { guessMapping, type ImportMapping } from "@/lib/data/import-fields";
import { ImportFileError, parseImportFile, readCsvText, validateRows } from "@/lib/data/import-inventory";

const header = "Account,Site name,Service address,City,Hazard,Type,Manufacturer,Serial number,Location,Installed,Owner email";
const mapping: ImportMapping = guessMapping(header.split(","));
const TODAY = "2026-06-15";

function validate(lines: string[], map = mapping) {
  return validateRows(parseImportFile([header, ...lines].join("\n"), map), map, TODAY);
}

describe("readCsvText", () => {
  test("UTF-8 passes, with or without a byte-order mark", () => {
    expect(readCsvText(new TextEncoder().encode("a,b\nc,é\n"))).toBe("a,b\nc,é\n");
    expect(readCsvText(new Uint8Array([0xef, 0xbb, 0xbf, 0x61]))).toBe("a");
  });

  test("a Windows-1252 byte is refused with its line", () => {
    const bytes = new Uint8Array([...new TextEncoder().encode("a,b\nc,d\nCaf"), 0xe9, 0x0a]);
    expect(() => readCsvText(bytes)).toThrow(ImportFileError);
    expect(() => readCsvText(bytes)).toThrow(/line 3 has a character in another encoding/);
  });

  test.each([
    { label: "overlong encoding", bytes: [0xc0, 0x80] },
    { label: "a truncated sequence at the end", bytes: [0x61, 0xe2, 0x82] },
    { label: "a surrogate half", bytes: [0xed, 0xa0, 0x80] },
    { label: "beyond U+10FFFF", bytes: [0xf4, 0x90, 0x80, 0x80] },
  ])("refuses $label", ({ bytes }) => {
    expect(() => readCsvText(new Uint8Array(bytes))).toThrow(/not UTF-8/);
  });

  test("UTF-16 is named as such", () => {
    expect(() => readCsvText(new Uint8Array([0xff, 0xfe, 0x61, 0x00]))).toThrow(/UTF-16/);
  });
});

describe("parseImportFile", () => {
  test("counts empty lines but not the final line break", () => {
    const file = parseImportFile(`${header}\nA1,S,1 Row,T,low,RP,M,S1,L,2020-01-01,\n\n  \nA2,S,1 Row,T,low,RP,M,S2,L,2020-01-01,\n`, mapping);
    expect(file.records.map((r) => r.row)).toEqual([2, 5]);
    expect(file.emptyLines).toBe(2);
  });

  test.each([
    { label: "an empty file", text: "", message: /empty/ },
    { label: "a header without rows", text: `${header}\n\n`, message: /no rows to import/ },
    { label: "two columns with one name", text: "Account,account\nA,B\n", message: /Two columns are named/ },
  ])("refuses $label", ({ text, message }) => {
    expect(() => parseImportFile(text, mapping)).toThrow(message);
  });

  test("refuses a mapping that names a missing column, or lacks the account number", () => {
    expect(() => parseImportFile("Acct\nA1\n", { accountNumber: "Account" })).toThrow(/no column “Account”/);
    expect(() => parseImportFile("Account,Serial\nA1,S\n", { serial: "Serial" })).toThrow(/Account number/);
    expect(() => parseImportFile("Account,Serial\nA1,S\n", { accountNumber: "Account", serial: "Serial" })).toThrow(/Assembly kind/);
  });

  test("reads semicolon-separated files too", () => {
    const file = parseImportFile("Account;Type;Serial number\nA1;RP;S1\n", { accountNumber: "Account", kind: "Type", serial: "Serial number" });
    expect(file.records[0]!.cells).toEqual(["A1", "RP", "S1"]);
  });
});

describe("validateRows", () => {
  test("accepts codes, full names and aliases; dates as YYYY-MM-DD or MM/DD/YYYY", () => {
    const { valid, invalid } = validate(["A1,S,1 Row,T,High,rp,M,S1,L,2020-01-31,", "A2,S,1 Row,T,non-health,Double check valve assembly,M,S2,L,3/7/2021,", "A3,S,1 Row,T,,PVB,,,yard,,"]);
    expect(invalid).toEqual([]);
    expect(valid.map((r) => [r.values.kind, r.values.siteHazard ?? null, r.values.installedOn ?? null])).toEqual([
      ["RP", "high", "2020-01-31"],
      ["DC", "low", "2021-03-07"],
      ["PVB", null, null],
    ]);
  });

  test.each([
    { label: "an unknown kind", line: "A1,S,1 Row,T,low,XR,M,S1,L,2020-01-01,", message: /assembly kind “XR”/ },
    { label: "an unknown hazard", line: "A1,S,1 Row,T,extreme,RP,M,S1,L,2020-01-01,", message: /site hazard “extreme”/ },
    { label: "an impossible date", line: "A1,S,1 Row,T,low,RP,M,S1,L,2021-02-29,", message: /not a date/ },
    { label: "a day-first date", line: "A1,S,1 Row,T,low,RP,M,S1,L,31/12/2020,", message: /not a date/ },
    { label: "a future installation", line: "A1,S,1 Row,T,low,RP,M,S1,L,2026-06-16,", message: /in the future/ },
    { label: "a bad e-mail", line: "A1,S,1 Row,T,low,RP,M,S1,L,2020-01-01,nobody", message: /not an e-mail address/ },
    { label: "no serial and no location", line: "A1,S,1 Row,T,low,RP,M,,,2020-01-01,", message: /serial or a location/ },
    { label: "assembly data without a kind", line: "A1,S,1 Row,T,low,,M,S1,L,2020-01-01,", message: /kind is empty/ },
    { label: "an account number that is too long", line: `${"A".repeat(41)},S,1 Row,T,low,RP,M,S1,L,2020-01-01,`, message: /longer than 40/ },
    { label: "too many values", line: "A1,S,1 Row,T,low,RP,M,S1,L,2020-01-01,,extra", message: /12 values but the header has 11 columns/ },
    { label: "too few values", line: "A1,S,1 Row", message: /3 values but the header has 11/ },
  ])("reports $label", ({ line, message }) => {
    const { valid, invalid } = validate([line]);
    expect(valid).toEqual([]);
    expect(invalid[0]!.problems.join(" ")).toMatch(message);
  });

  test("the same assembly twice in a file: the second is reported with the first's row", () => {
    const { valid, invalid } = validate(["A1,S,1 Row,T,low,RP,Tallowmere,S1,L,2020-01-01,", "A9,S,1 Row,T,low,RP,tallowmere,s1,L2,2020-01-01,", "A1,S,1 Row,T,low,PVB,,,Yard,2020-01-01,", "A1,S,1 Row,T,low,PVB,,,yard,2020-01-01,"]);
    expect(valid.map((r) => r.row)).toEqual([2, 4]);
    expect(invalid.map((r) => [r.row, r.problems[0]])).toEqual([
      [3, "the same assembly as row 2 (same make and serial)"],
      [5, "the same assembly as row 4 (same account and location)"],
    ]);
  });

  test("rows of one account take the site values of its first row that has them", () => {
    const { valid } = validate(["A1,Mill,1 Row,T,high,RP,M,S1,L,2020-01-01,", "A1,Mill Annex,,T,low,DC,M,S2,L,2020-01-01,", "A2,,,,,DC,M,S3,L,2020-01-01,", "A2,Kiln,2 Row,T,low,DC,M,S4,L,2020-01-01,"]);
    expect(valid.map((r) => [r.values.siteName, r.values.siteHazard])).toEqual([
      ["Mill", "high"],
      ["Mill", "high"],
      ["Kiln", "low"],
      ["Kiln", "low"],
    ]);
  });
});

describe("guessMapping", () => {
  test("maps headers by name and synonyms, each column once", () => {
    expect(guessMapping(["Acct No", "Customer", "Street Address", "Town", "ZIP", "Device Type", "Mfr", "Serial #", "Install Date", "Phone"])).toEqual({
      accountNumber: "Acct No",
      siteName: "Customer",
      addressLine1: "Street Address",
      city: "Town",
      postalCode: "ZIP",
      kind: "Device Type",
      make: "Mfr",
      serial: "Serial #",
      installedOn: "Install Date",
      contactPhone: "Phone",
    });
  });
});
