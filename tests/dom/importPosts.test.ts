// @vitest-environment jsdom
/** Posts from a CSV file through the import path the picker and the map's drop share. */
import { beforeEach, describe, expect, it } from "vitest";
import { MAX_RADARS_PER_RUN } from "../../src/io/siteGrid";
import { importFile } from "../../src/ui/import/importFiles";
import { useSession } from "../../src/ui/session";
import { usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";

/** A posts CSV of `n` rows on a grid of points 20 m apart beside the sample site. */
function postsCsv(n: number): File {
  const rows = ["name,lat,lon,mast_height_m"];
  for (let i = 0; i < n; i++)
    rows.push(`P${i},${47.1 + (i % 50) * 0.0002},${15.3 + Math.floor(i / 50) * 0.0002},10`);
  return new File([rows.join("\n")], "candidates.csv", { type: "text/csv" });
}

const lastMessage = () => useSession.getState().messages.at(-1);

describe("posts imported from CSV", () => {
  beforeEach(() => {
    usePlanStore.getState().load(samplePlan());
    useSession.setState({ messages: [] });
  });

  it("adds the rows as enabled posts in one undo step", async () => {
    const before = usePlanStore.getState().plan!.posts.length;
    await importFile(postsCsv(3));
    expect(usePlanStore.getState().plan!.posts.length).toBe(before + 3);
    expect(lastMessage()?.text).toBe("Imported 3 posts from candidates.csv.");
  });

  it("refuses a file that would give a run more posts than it takes, and leaves the plan as it was", async () => {
    const plan = usePlanStore.getState().plan!;
    const enabled = plan.posts.filter((p) => p.enabled).length;
    const n = MAX_RADARS_PER_RUN - enabled + 1;
    await importFile(postsCsv(n));
    expect(usePlanStore.getState().plan).toBe(plan);
    expect(lastMessage()?.kind).toBe("error");
    expect(lastMessage()?.text).toBe(
      `candidates.csv: ${n} posts would make ${MAX_RADARS_PER_RUN + 1} enabled posts; at most ${MAX_RADARS_PER_RUN} can take part in one run. Import the candidates in smaller files; the plan is unchanged.`,
    );
  });
});
