/** Posts: the list (select, enable), and the selected post's radar, mast, boresight, tilt and sector. */
import type { Post } from "../../io/planSchema";
import { radarModelOfPost } from "../../io/planValidation";
import { UTM_MAX_LAT_DEG, UTM_MIN_LAT_DEG } from "../../io/siteGrid";
import { CheckField, NumberField, SelectField, TextField } from "../components/NumberField";
import { formatLatLon, tenthOfDegree } from "../numberText";
import { removePost, updatePost } from "../planEdits";
import { movePostTo } from "../postMoves";
import { useSession } from "../session";
import { usePlanStore } from "../store";
import { PostExposure } from "./PostExposure";

/** Decimal places of a typed position: 1e-6° is about 0.1 m on the ground. */
const COORD_DIGITS = 6;

function PostEditor({ post }: { post: Post }) {
  const plan = usePlanStore((s) => s.plan);
  const change = usePlanStore((s) => s.change);
  const setSession = useSession((s) => s.set);
  if (!plan) return null;
  const edit = (patch: Partial<Post>, label: string) => change((p) => updatePost(p, post.id, patch), label);
  const editSector = (patch: Partial<NonNullable<Post["scanSector"]>>) => {
    if (post.scanSector) edit({ scanSector: { ...post.scanSector, ...patch } }, "sector");
  };
  const models = plan.radarModels.map((m) => ({ value: m.id, label: m.name }));
  const model = radarModelOfPost(plan, post);
  const inline = post.radarModel
    ? [{ value: "__inline", label: `${post.radarModel.name} (this post only)` }]
    : [];
  return (
    <div className="post-editor" data-testid="post-editor">
      <h3>{post.name}</h3>
      <TextField
        label="Name"
        value={post.name}
        onCommit={(name) => edit({ name }, "post name")}
        testId="post-name"
      />
      <SelectField
        label="Radar model"
        value={post.radarModel ? "__inline" : (post.radarModelId ?? "")}
        options={[...models, ...inline]}
        onChange={(v) => v !== "__inline" && edit({ radarModelId: v, radarModel: undefined }, "radar model")}
        testId="post-model"
      />
      <SelectField
        label="Mounting"
        value={post.mounting}
        options={[
          { value: "ground", label: "Mast on the ground" },
          { value: "roof", label: "On a roof" },
        ]}
        onChange={(mounting) => edit({ mounting }, "mounting")}
      />
      <NumberField
        label="Mast height (antenna above ground)"
        unit="m AGL"
        min={0}
        max={300}
        value={post.mastHeightM}
        onCommit={(mastHeightM) => edit({ mastHeightM }, "mast height")}
        testId="post-mast"
      />
      <NumberField
        label="Boresight azimuth (from true north)"
        unit="°"
        min={0}
        max={359.99}
        digits={1}
        value={post.boresightAzDeg}
        // Kept to the 0.1° shown (as the map's handle turns it): 359.96° is 0.0°, not a hidden 360.0°.
        onCommit={(v) => edit({ boresightAzDeg: tenthOfDegree(v) }, "boresight")}
        testId="post-boresight"
      />
      <NumberField
        label="Tilt (up positive)"
        unit="°"
        min={-90}
        max={90}
        digits={1}
        value={post.tiltDeg}
        onCommit={(tiltDeg) => edit({ tiltDeg }, "tilt")}
        testId="post-tilt"
      />
      <CheckField
        label="Own scan sector (instead of the model's)"
        checked={post.scanSector !== undefined}
        onChange={(on) =>
          edit(
            { scanSector: on ? { centreAzDeg: post.boresightAzDeg, widthDeg: 90 } : undefined },
            "scan sector",
          )
        }
      />
      {post.scanSector && (
        <>
          <NumberField
            label="Sector centre"
            unit="°"
            min={0}
            max={359.99}
            value={post.scanSector.centreAzDeg}
            onCommit={(centreAzDeg) => editSector({ centreAzDeg })}
          />
          <NumberField
            label="Sector width"
            unit="°"
            min={1}
            max={360}
            value={post.scanSector.widthDeg}
            onCommit={(widthDeg) => editSector({ widthDeg })}
          />
        </>
      )}
      <NumberField
        label="Latitude (WGS 84, north positive)"
        unit="°"
        min={UTM_MIN_LAT_DEG}
        max={UTM_MAX_LAT_DEG}
        digits={COORD_DIGITS}
        value={post.position.latDeg}
        onCommit={(latDeg) => movePostTo(post.id, post.position.lonDeg, latDeg)}
        testId="post-lat"
      />
      <NumberField
        label="Longitude (WGS 84, east positive)"
        unit="°"
        min={-180}
        max={180}
        digits={COORD_DIGITS}
        value={post.position.lonDeg}
        onCommit={(lonDeg) => movePostTo(post.id, lonDeg, post.position.latDeg)}
        testId="post-lon"
      />
      <p className="muted">
        {formatLatLon(post.position.latDeg, post.position.lonDeg)} — type surveyed coordinates above, or drag
        the post on the map to move it and the orange handle to turn it.
      </p>
      {model && <PostExposure model={model} antennaAglM={post.mastHeightM} />}
      <button
        type="button"
        className="danger"
        onClick={() => {
          change((p) => removePost(p, post.id), "delete post");
          setSession({ selectedPostId: null });
        }}
      >
        Delete post
      </button>
    </div>
  );
}

export function PostsPanel() {
  const plan = usePlanStore((s) => s.plan);
  const change = usePlanStore((s) => s.change);
  const selected = useSession((s) => s.selectedPostId);
  const tool = useSession((s) => s.tool);
  const setSession = useSession((s) => s.set);
  if (!plan) return null;
  const post = plan.posts.find((p) => p.id === selected);
  return (
    <div className="panel" data-testid="posts-panel">
      <button
        type="button"
        aria-pressed={tool === "post"}
        data-testid="tool-post"
        onClick={() => setSession({ tool: tool === "post" ? "select" : "post" })}
      >
        {tool === "post" ? "Click the map to place a post (Esc to stop)" : "Add post on the map"}
      </button>
      <ul className="plain-list post-list" data-testid="post-list">
        {plan.posts.map((p) => (
          <li key={p.id} className={p.id === selected ? "selected" : undefined}>
            <input
              type="checkbox"
              checked={p.enabled}
              aria-label={`${p.name} takes part`}
              onChange={(e) =>
                change((pl) => updatePost(pl, p.id, { enabled: e.target.checked }), "enable post")
              }
            />
            <button type="button" className="link" onClick={() => setSession({ selectedPostId: p.id })}>
              {p.name}
            </button>
            <span className="muted">{p.mastHeightM} m</span>
          </li>
        ))}
      </ul>
      {plan.posts.length === 0 && <p className="muted">No posts yet.</p>}
      {post && <PostEditor post={post} />}
    </div>
  );
}
