import { describe, expect, it } from "vitest";
import { escapeCsvCell, toCsv } from "../csv";

// Expected forms follow RFC 4180 §2 (quoting) and the OWASP "CSV Injection" page (leading quote
// before =, +, -, @, tab, carriage return).
describe("escapeCsvCell(cell)", () => {
  it.each([
    ["=HYPERLINK(\"http://x\")", `"'=HYPERLINK(""http://x"")"`],
    ["+1+2", "'+1+2"],
    ["-2+3", "'-2+3"],
    ["@SUM(A1)", "'@SUM(A1)"],
    ["\tcmd", "'\tcmd"],
    ["\r=1", `"'\r=1"`],
    ["plain", "plain"],
    ["a,b", '"a,b"'],
    ['say "hi"', '"say ""hi"""'],
    ["line\nbreak", '"line\nbreak"'],
  ])("%j → %j", (input, output) => expect(escapeCsvCell(input)).toBe(output));

  it("writes numbers as numbers, negative ones unescaped, and blanks for null/NaN", () => {
    expect(escapeCsvCell(-12.5)).toBe("-12.5");
    expect(escapeCsvCell(0)).toBe("0");
    expect(escapeCsvCell(null)).toBe("");
    expect(escapeCsvCell(Number.NaN)).toBe("");
  });
});

describe("toCsv(header, rows)", () => {
  it("uses CRLF line ends (RFC 4180 §2.1) and ends with one", () => {
    expect(toCsv(["a", "b"], [[1, "=x"], [null, "y"]])).toBe("a,b\r\n1,'=x\r\n,y\r\n");
  });
});
