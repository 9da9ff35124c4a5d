// CSV written for downloads: formula cells neutralised (OWASP "CSV Injection"), RFC 4180 quoting.
import { describe, expect, test } from "vitest";
import { csvField, csvLine, neutralizeFormula, toCsv } from "@/lib/data/import-csv";

describe("neutralizeFormula", () => {
  test.each([
    { label: "equals", value: "=SUM(A1:A9)", expected: "'=SUM(A1:A9)" },
    { label: "plus", value: "+1555-0100", expected: "'+1555-0100" },
    { label: "minus with letters", value: "-2+3", expected: "'-2+3" },
    { label: "at", value: "@cmd", expected: "'@cmd" },
    { label: "tab", value: "\t=1", expected: "'\t=1" },
    { label: "carriage return", value: "\r=1", expected: "'\r=1" },
    { label: "a plain negative number stays a number", value: "-2.5", expected: "-2.5" },
    { label: "a negative whole number", value: "-7", expected: "-7" },
    { label: "ordinary text", value: "Fernhollow Bakery", expected: "Fernhollow Bakery" },
    { label: "equals later in the text", value: "a=b", expected: "a=b" },
    { label: "empty", value: "", expected: "" },
  ])("$label", ({ value, expected }) => {
    expect(neutralizeFormula(value)).toBe(expected);
  });
});

describe("csvField and toCsv", () => {
  test.each([
    { label: "comma", value: "Row, Quillmere", expected: '"Row, Quillmere"' },
    { label: "quote", value: 'the "old" one', expected: '"the ""old"" one"' },
    { label: "line break", value: "a\nb", expected: '"a\nb"' },
    { label: "formula with a quote", value: '=HYPERLINK("x")', expected: `"'=HYPERLINK(""x"")"` },
    { label: "number", value: 42, expected: "42" },
    { label: "null", value: null, expected: "" },
    { label: "boolean", value: true, expected: "yes" },
    { label: "object as JSON", value: { a: 1 }, expected: '"{""a"":1}"' },
  ])("$label", ({ value, expected }) => {
    expect(csvField(value)).toBe(expected);
  });

  test("a document has a byte-order mark, CRLF line ends and a final line end", () => {
    expect(toCsv(["a", "b"], [[1, "=x"]])).toBe("\uFEFFa,b\r\n1,'=x\r\n");
    expect(csvLine(["x", "", "y"])).toBe("x,,y");
  });
});
