/**
 * The building or tree stand chosen on the map: its height above ground (and where that height came
 * from), and Delete. Every change is one undo step.
 */
import type { ReactNode } from "react";
import { DEFAULT_METRES_PER_LEVEL, MAX_OBSTRUCTION_HEIGHT_M } from "../../coverage/constants";
import { buildingName, roofHeightOf } from "../../io/buildingHeight";
import { NumberField } from "../components/NumberField";
import { removeBuilding, removeTreeStand, setBuildingHeight, setCanopyHeight } from "../planEdits";
import { useSession } from "../session";
import { usePlanStore } from "../store";

/** Canopy limit of the plan format (planSchema.ts treeStands[].canopyHeightM), m. */
const MAX_CANOPY_HEIGHT_M = 150;
/** Lowest height given to a drawn or edited obstruction, m (as for new buildings and tree stands). */
const MIN_OBSTRUCTION_HEIGHT_M = 0.5;

/** The card both kinds share: name, height above ground, a note, Delete and Done. */
function ObstructionCard(p: {
  kind: "building" | "tree stand";
  title: string;
  heightLabel: string;
  maxHeightM: number;
  heightM: number;
  onHeight: (heightM: number) => void;
  note?: ReactNode;
  onDelete: () => void;
  onClose: () => void;
}) {
  return (
    <section className="obstruction-editor" aria-label={`Chosen ${p.kind}`} data-testid="obstruction-editor">
      <h3>{p.title}</h3>
      <NumberField
        label={p.heightLabel}
        unit="m AGL"
        min={MIN_OBSTRUCTION_HEIGHT_M}
        max={p.maxHeightM}
        value={p.heightM}
        testId="obstruction-height"
        onCommit={p.onHeight}
      />
      {p.note && <p className="muted">{p.note}</p>}
      <div className="button-row">
        <button
          type="button"
          data-testid="obstruction-delete"
          onClick={() => {
            p.onDelete();
            p.onClose();
          }}
        >
          Delete {p.kind}
        </button>
        <button type="button" onClick={p.onClose}>
          Done
        </button>
      </div>
    </section>
  );
}

export function ObstructionEditor() {
  const sel = useSession((s) => s.selectedObstruction);
  const setSession = useSession((s) => s.set);
  const plan = usePlanStore((s) => s.plan);
  const change = usePlanStore((s) => s.change);
  if (!plan || !sel) return null;
  const close = () => setSession({ selectedObstruction: null });
  if (sel.kind === "building") {
    const f = plan.terrain.buildings.features[sel.index];
    // Gone after an undo or an import: nothing to edit.
    if (!f) return null;
    const { heightM, source } = roofHeightOf(f.properties);
    const from =
      source === "height"
        ? "the footprint's height value"
        : source === "levels"
          ? `${f.properties["building:levels"] ?? heightM / DEFAULT_METRES_PER_LEVEL} levels × ${DEFAULT_METRES_PER_LEVEL} m`
          : "the default: the file gave no height";
    return (
      <ObstructionCard
        kind="building"
        title={buildingName(f, sel.index)}
        heightLabel="Roof height"
        maxHeightM={MAX_OBSTRUCTION_HEIGHT_M}
        heightM={heightM}
        onHeight={(v) => change((p) => setBuildingHeight(p, sel.index, v), "building height")}
        note={
          <>
            From {from}.{f.id !== undefined && ` Identifier ${f.id}.`}
          </>
        }
        onDelete={() => change((p) => removeBuilding(p, sel.index), "delete building")}
        onClose={close}
      />
    );
  }
  const t = plan.terrain.treeStands.find((s) => s.id === sel.id);
  if (!t) return null;
  return (
    <ObstructionCard
      kind="tree stand"
      title={t.name ?? t.id}
      heightLabel="Canopy height"
      maxHeightM={MAX_CANOPY_HEIGHT_M}
      heightM={t.canopyHeightM}
      onHeight={(v) => change((p) => setCanopyHeight(p, t.id, v), "canopy height")}
      onDelete={() => change((p) => removeTreeStand(p, t.id), "delete tree stand")}
      onClose={close}
    />
  );
}
