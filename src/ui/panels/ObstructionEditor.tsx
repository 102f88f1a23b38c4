/**
 * The building or tree stand chosen on the map: its height above ground (and where that height came
 * from), and Delete. Every change is one undo step.
 */
import { DEFAULT_METRES_PER_LEVEL, MAX_OBSTRUCTION_HEIGHT_M } from "../../coverage/constants";
import { NumberField } from "../components/NumberField";
import { removeBuilding, removeTreeStand, setBuildingHeight, setCanopyHeight } from "../planEdits";
import { roofHeightOf } from "../roofs";
import { useSession } from "../session";
import { usePlanStore } from "../store";

/** Canopy limit of the plan format (planSchema.ts treeStands[].canopyHeightM), m. */
const MAX_CANOPY_HEIGHT_M = 150;
/** Lowest height given to a drawn or edited obstruction, m (as for new buildings and tree stands). */
const MIN_OBSTRUCTION_HEIGHT_M = 0.5;

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
    const name =
      typeof f.properties.name === "string" ? f.properties.name : `Building ${f.id ?? sel.index + 1}`;
    const from =
      source === "height"
        ? "the footprint's height value"
        : source === "levels"
          ? `${f.properties["building:levels"]} levels × ${DEFAULT_METRES_PER_LEVEL} m`
          : "the default: the file gave no height";
    return (
      <section className="obstruction-editor" aria-label="Chosen building" data-testid="obstruction-editor">
        <h3>{name}</h3>
        <NumberField
          label="Roof height"
          unit="m AGL"
          min={MIN_OBSTRUCTION_HEIGHT_M}
          max={MAX_OBSTRUCTION_HEIGHT_M}
          value={heightM}
          testId="obstruction-height"
          onCommit={(v) => change((p) => setBuildingHeight(p, sel.index, v), "building height")}
        />
        <p className="muted">
          From {from}.{f.id !== undefined && ` Identifier ${f.id}.`}
        </p>
        <div className="button-row">
          <button
            type="button"
            data-testid="obstruction-delete"
            onClick={() => {
              change((p) => removeBuilding(p, sel.index), "delete building");
              close();
            }}
          >
            Delete building
          </button>
          <button type="button" onClick={close}>
            Done
          </button>
        </div>
      </section>
    );
  }
  const t = plan.terrain.treeStands.find((s) => s.id === sel.id);
  if (!t) return null;
  return (
    <section className="obstruction-editor" aria-label="Chosen tree stand" data-testid="obstruction-editor">
      <h3>{t.name ?? t.id}</h3>
      <NumberField
        label="Canopy height"
        unit="m AGL"
        min={MIN_OBSTRUCTION_HEIGHT_M}
        max={MAX_CANOPY_HEIGHT_M}
        value={t.canopyHeightM}
        testId="obstruction-height"
        onCommit={(v) => change((p) => setCanopyHeight(p, t.id, v), "canopy height")}
      />
      <div className="button-row">
        <button
          type="button"
          data-testid="obstruction-delete"
          onClick={() => {
            change((p) => removeTreeStand(p, t.id), "delete tree stand");
            close();
          }}
        >
          Delete tree stand
        </button>
        <button type="button" onClick={close}>
          Done
        </button>
      </div>
    </section>
  );
}
