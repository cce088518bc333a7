import { describe, expect, it } from "vitest";
import { TableBuilder, csvCell, tableToCsv } from "../../src/measures/table.js";

function build(n: number, maxRows: number, edgeRows: number) {
  const t = new TableBuilder(["index", "x"], maxRows, edgeRows);
  for (let i = 1; i <= n; i++) t.add([i, i * 10]);
  return t.build();
}

describe("TableBuilder", () => {
  it("keeps a table of at most maxRows rows whole", () => {
    const t = build(100, 100, 10);
    expect(t.shortened).toBe(false);
    expect(t.rows.map((r) => r[0])).toEqual(Array.from({ length: 100 }, (_, i) => i + 1));
  });

  it("shortens a long table to head, checkpoints and tail, never more than maxRows rows, indices increasing", () => {
    for (const n of [101, 1000, 12345, 200_000]) {
      const t = build(n, 100, 10);
      expect(t.shortened).toBe(true);
      expect(t.rowsTotal).toBe(n);
      expect(t.rows.length).toBeLessThanOrEqual(100);
      const idx = t.rows.map((r) => r[0] as number);
      // head: rows 1..10; tail: the last 10 rows (common practice for long listings)
      expect(idx.slice(0, 10)).toEqual(Array.from({ length: 10 }, (_, i) => i + 1));
      expect(idx.slice(-10)).toEqual(Array.from({ length: 10 }, (_, i) => n - 9 + i));
      for (let i = 1; i < idx.length; i++) expect(idx[i]).toBeGreaterThan(idx[i - 1]);
      // every kept row is the row that was added at that index
      for (const r of t.rows) expect(r[1]).toBe((r[0] as number) * 10);
    }
  });

  it("addNumbers keeps exactly the rows add keeps, also after text and empty cells went through the tail", () => {
    for (const n of [1, 99, 100, 101, 1000, 12345]) {
      for (const textAt of [-1, 5, Math.floor(n / 2), n - 3]) {
        const plain = new TableBuilder(["index", "x", "y"], 100, 10);
        const fast = new TableBuilder(["index", "x", "y"], 100, 10);
        for (let i = 1; i <= n; i++) {
          if (i === textAt || i === textAt + 1) {
            const row = [i, "text", null];
            plain.add(row);
            fast.add(row);
          } else {
            const row = [i, i * 10, i % 7 === 0 ? NaN : i / 3];
            plain.add(row);
            fast.addNumbers(row);
          }
        }
        expect(fast.build(), `n ${n}, text at ${textAt}`).toEqual(plain.build());
      }
    }
  });

  it("csvCell quotes text with commas, quotes or edge spaces (RFC 4180) and writes numbers round-trip", () => {
    expect(csvCell('a,"b"')).toBe('"a,""b"""');
    expect(csvCell(" x")).toBe('" x"');
    expect(csvCell(0.1 + 0.2)).toBe("0.30000000000000004");
    expect(csvCell(-0)).toBe("0");
    expect(csvCell(null)).toBe("");
    expect(tableToCsv({ columns: ["a"], rows: [[1]], rowsTotal: 1, shortened: false })).toBe("a\n1\n");
  });

  it("csvCell writes text a spreadsheet would take for a formula with a leading apostrophe, and numbers as they are (common practice against CSV injection)", () => {
    for (const text of ["=1+2", "+cmd", "-2+3", "@SUM(A1)", "=HYPERLINK(\"x\")"]) {
      const cell = csvCell(text);
      // read back as RFC 4180 does: unquote, then the first character must be the apostrophe
      const read = cell.startsWith('"') ? cell.slice(1, -1).replace(/""/g, '"') : cell;
      expect(read, text).toBe(`'${text}`);
    }
    expect(csvCell("\tx")).toBe("'\tx");
    expect(csvCell("\rx")).toBe("\"'\rx\""); // a carriage return also needs quotes (RFC 4180)
    expect(csvCell("-")).toBe("'-");
    expect(csvCell("a=b")).toBe("a=b"); // only the first character counts
    expect(csvCell("rep-01")).toBe("rep-01");
    expect(csvCell(-2.5)).toBe("-2.5");
    expect(csvCell(-1e-300)).toBe("-1e-300");
    expect(tableToCsv({ columns: ["entity", "value"], rows: [["-7", -7], ["@x", 1]], rowsTotal: 2, shortened: false })).toBe("entity,value\n'-7,-7\n'@x,1\n");
  });
});
