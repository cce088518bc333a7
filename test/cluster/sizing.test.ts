import { describe, expect, it } from "vitest";
import { arrayList, arrayRequest, reportRequest, taskRequest } from "../../src/cluster/sizing.js";

const MB = 1024 * 1024;

describe("task requests from run file sizes (the rule of docs/distributed.md, computed by hand)", () => {
  it("taskRequest(bytes, file): 256 MB + 1 MB per MB of text, 10 min + 1 min per 1,000 MB; gzip counts 6 times, Parquet 4 times", () => {
    expect(taskRequest(100 * MB, "a.csv")).toEqual({ memoryMb: 356, minutes: 11 });
    expect(taskRequest(100 * MB, "a.csv.gz")).toEqual({ memoryMb: 856, minutes: 11 });
    expect(taskRequest(500 * MB, "a.parquet")).toEqual({ memoryMb: 2256, minutes: 12 });
    expect(taskRequest(3000 * MB, "a.jsonl")).toEqual({ memoryMb: 3256, minutes: 13 });
    expect(taskRequest(0, "a.csv")).toEqual({ memoryMb: 256, minutes: 10 });
  });

  it("arrayRequest takes the largest task's needs; reportRequest adds 1 GB and gives 30 minutes", () => {
    const r = arrayRequest([{ bytes: 10 * MB, file: "a.csv" }, { bytes: 10 * MB, file: "b.csv.gz" }, { bytes: 2500 * MB, file: "c.csv" }]);
    expect(r).toEqual({ memoryMb: 2756, minutes: 13 });
    expect(reportRequest(r)).toEqual({ memoryMb: 3780, minutes: 30 });
  });

  it("arrayList writes consecutive indices as ranges, in order (Slurm's --array list syntax, from the sbatch manual)", () => {
    expect(arrayList([3, 0, 1, 2, 7, 9, 10])).toBe("0-3,7,9-10");
    expect(arrayList([5])).toBe("5");
  });
});
