/**
 * `CsvRecords` reads the cells of numeric columns (`RecordSink.numeric`) as numbers straight from
 * the bytes. Property: each such cell is the double `parseDecimalText` gives its text (the value
 * `Number()` gives, the correctly rounded one; ECMA-262 StringToNumber), and a cell the in-place
 * reader declines comes as its text, as before, so the layouts' messages do not change.
 */
import { describe, expect, it } from "vitest";
import { parseDecimalText } from "../../src/ingest/decimal.js";
import { type Cell, CsvRecords, type RecordSink } from "../../src/ingest/records.js";

function read(text: string, wanted: string[], numeric: boolean[]): Cell[][] {
  const out: Cell[][] = [];
  const sink: RecordSink = { wanted, numeric, header: () => {}, record: (cells) => out.push([...cells]), finish: () => {} };
  const r = new CsvRecords(sink, "r.csv");
  r.parse(Buffer.from(text), 0, true);
  r.finish();
  return out;
}

describe("CsvRecords with numeric columns", () => {
  const cells = ["1.5", " 2.25 ", "+3", "-0", "0.1", "1e-7", ".5", "5.", "123456789012345678", "0.30000000000000004", "1e400", "0x10", "1,5", "abc", ""];
  it("a plain decimal comes as the number parseDecimalText gives its text; any other cell as its text (null when empty)", () => {
    const body = cells.map((c, i) => `${i},${c.includes(",") ? `"${c}"` : c}\r\n`).join("");
    const got = read(`id,t\r\n${body}`, ["id", "t"], [false, true]);
    expect(got.length).toBe(cells.length);
    got.forEach(([id, t], i) => {
      expect(id).toBe(String(i));
      const c = cells[i];
      const x = parseDecimalText(c);
      if (c === "") expect(t).toBeNull();
      else if (x !== undefined && !c.includes(",")) expect(Object.is(t, x)).toBe(true); // same double, -0 included
      else expect(t).toBe(c.trim()); // declined: the text, for the layout's own message
    });
  });

  it("a numeric column also read by a where keeps its text (where compares texts as written)", () => {
    const got = read("id,t\n1,1.50\n", ["id", "t", "t"], [false, true, false]);
    expect(got).toEqual([["1", "1.50", "1.50"]]);
  });

  it("without numeric, every cell comes as text", () => {
    expect(read("id,t\n1,1.50\n", ["id", "t"], [false, false])).toEqual([["1", "1.50"]]);
  });
});
