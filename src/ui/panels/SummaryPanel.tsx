/**
 * The summary: per height the covered fractions of the protected area and approach ring, gaps (count
 * and area), the overlap histogram and what each radar contributes. Updates with every run.
 */
import { formatAreaM2 } from "../../map/gapOutlines";
import type { CoverageSlice } from "../../workers/protocol";
import { ColumnHeads } from "../components/ColumnHeads";
import { shownView, useCoverage } from "../coverageState";
import { postsMetElsewhere, selectedSlice } from "../selection";
import { useSession } from "../session";
import { usePlanStore } from "../store";

const PERCENT = 100;

function pct(f: number): string {
  return Number.isFinite(f) ? `${(f * PERCENT).toFixed(1)} %` : "—";
}

function OverlapBars({ slice }: { slice: CoverageSlice }) {
  const h = slice.metrics.overlapHistogram;
  const total = h.reduce((a, b) => a + b, 0);
  return (
    <table className="bars" data-testid="overlap-histogram">
      <caption>Overlap: share of the protected area and ring met by n radars</caption>
      <tbody>
        {h.map((count, n) => (
          // biome-ignore lint/suspicious/noArrayIndexKey: the index is the radar count
          <tr key={n}>
            <th scope="row">{n}</th>
            <td>
              <span className="bar" style={{ width: `${total ? (count / total) * PERCENT : 0}%` }} />
            </td>
            <td className="num">{pct(total ? count / total : Number.NaN)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function SummaryPanel() {
  const view = useCoverage(shownView);
  const plan = usePlanStore((s) => s.plan);
  const classId = useSession((s) => s.classId);
  const heightM = useSession((s) => s.heightM);
  const set = useSession((s) => s.set);
  const slice = selectedSlice(view, classId, heightM);
  if (!view || !slice || !plan) return <p className="muted">No results yet.</p>;
  const ofClass = view.slices.filter((s) => s.classId === slice.classId);
  const name = (id: string) => plan.posts.find((p) => p.id === id)?.name ?? id;
  const spare = postsMetElsewhere(slice);
  return (
    <section
      className="summary"
      aria-label="Summary"
      data-testid="summary"
      data-generation={view.generation}
      data-mask-mode={view.maskMode}
      data-partial={view.partial ? "true" : undefined}
      data-computed-radars={view.computedRadarIds?.length}
    >
      <h3>Summary — {plan.targetClasses.find((t) => t.id === slice.classId)?.name}</h3>
      <table className="summary-table">
        <ColumnHeads
          names={["Height", "Protected area covered", "Approach ring covered", "Gaps", "Gap area"]}
        />
        <tbody>
          {ofClass.map((s) => (
            <tr
              key={s.heightM}
              className={s === slice ? "selected" : undefined}
              onClick={() => set({ heightM: s.heightM })}
            >
              <th scope="row">{s.heightM} m AGL</th>
              <td className="num" data-testid={`covered-protected-${s.heightM}`}>
                {pct(s.metrics.protectedArea.coveredFraction)}
              </td>
              <td className="num" data-testid={`covered-ring-${s.heightM}`}>
                {pct(s.metrics.approachRing.coveredFraction)}
              </td>
              <td className="num" data-testid={`gap-count-${s.heightM}`}>
                {s.metrics.gaps.count}
              </td>
              <td className="num" data-testid={`gap-area-${s.heightM}`}>
                {formatAreaM2(s.metrics.gaps.totalAreaM2)}
              </td>
            </tr>
          ))}
          {view.partial && (
            // The shown height is drawn first; the others follow from the same run a moment later.
            <tr data-testid="summary-updating">
              <th scope="row">Other heights</th>
              <td className="muted" colSpan={4}>
                updating…
              </td>
            </tr>
          )}
        </tbody>
      </table>
      {slice.metrics.protectedArea.insideObstructionCells > 0 && (
        <p className="muted">
          {formatAreaM2(slice.metrics.protectedArea.insideObstructionAreaM2)} of the protected area lies
          inside buildings or canopy at {slice.heightM} m and is left out of the fractions.
        </p>
      )}
      <OverlapBars slice={slice} />
      <table className="summary-table" data-testid="per-radar">
        <caption>Per radar at {slice.heightM} m AGL</caption>
        <ColumnHeads names={["Post", "Covers", "Only this one"]} />
        <tbody>
          {slice.metrics.perRadar.map((r) => (
            <tr key={r.radarId}>
              <th scope="row">{name(r.radarId)}</th>
              <td className="num">{formatAreaM2(r.coveredAreaM2)}</td>
              <td className="num">{formatAreaM2(r.onlyThisRadarAreaM2)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {spare.length > 0 && (
        <p className="muted" data-testid="posts-met-elsewhere">
          At {slice.heightM} m no cell relies on {spare.map(name).join(", ")} alone: every cell{" "}
          {spare.length > 1 ? "each meets" : "it meets"} is met by another post too. Candidates to remove or
          re-aim, one at a time: disable one and compare (check the other heights and classes).
        </p>
      )}
      <p className="muted">
        {view.maskMode === "fast" ? "Preview (fast masking)" : "Accurate masking"} · grid {view.frame.width} ×{" "}
        {view.frame.height} cells of {view.frame.cellSizeM} m · computed in {Math.round(view.elapsedMs)} ms
      </p>
    </section>
  );
}
