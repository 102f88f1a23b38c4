/**
 * View and session state that is not part of the plan (never undone, never saved in the plan file):
 * what is shown, what is selected, the active tool, messages, and the drag preview.
 */
import { create } from "zustand";
import type { ObstructionChoice } from "../map/siteLayer";

export type LayerKind = "combined" | "single" | "overlap" | "lowest";
export type Tool = "select" | "post" | "area" | "hole" | "building" | "tree" | "inspect";

export interface Message {
  id: number;
  kind: "info" | "warning" | "error";
  text: string;
  /** Further lines (e.g. one per bad field). */
  details?: string[];
}

export interface InspectPoint {
  lonDeg: number;
  latDeg: number;
}

export interface DragPreview {
  postId: string;
  lonDeg: number;
  latDeg: number;
}

export interface SessionState {
  heightM: number | null;
  classId: string | null;
  layer: LayerKind;
  singlePostId: string | null;
  selectedPostId: string | null;
  /** The building or tree stand chosen on the map for editing (Site panel). */
  selectedObstruction: ObstructionChoice | null;
  /** A plan tab to bring forward (e.g. after a click on the map chose something it edits); seq repeats a request. */
  planTabRequest: { id: string; seq: number } | null;
  tool: Tool;
  inspect: InspectPoint | null;
  /** The radar whose terrain profile the inspect panel shows (null: the best one). */
  profilePostId: string | null;
  dragPreview: DragPreview | null;
  messages: Message[];
  showGaps: boolean;
  showSectors: boolean;
  showExposure: boolean;
  showBuildings: boolean;
  /** Height given to a building drawn on the map, m AGL. */
  newBuildingHeightM: number;
  /** Canopy height given to a tree stand drawn on the map, m AGL. */
  newCanopyHeightM: number;
  set: (patch: Partial<Omit<SessionState, "set" | "say" | "dismiss">>) => void;
  say: (kind: Message["kind"], text: string, details?: string[]) => void;
  dismiss: (id: number) => void;
}

let nextMessageId = 1;
/** Messages kept on screen at once (older ones drop off). */
const MESSAGE_LIMIT = 5;
/** How long a note stays on screen, ms. */
const INFO_MESSAGE_MS = 12_000;

export const useSession = create<SessionState>()((set) => ({
  heightM: null,
  classId: null,
  layer: "combined",
  singlePostId: null,
  selectedPostId: null,
  selectedObstruction: null,
  planTabRequest: null,
  tool: "select",
  inspect: null,
  profilePostId: null,
  dragPreview: null,
  messages: [],
  showGaps: true,
  showSectors: true,
  showExposure: false,
  showBuildings: true,
  newBuildingHeightM: 10,
  newCanopyHeightM: 15,
  set: (patch) => set(patch),
  say: (kind, text, details) => {
    const id = nextMessageId++;
    set((s) => ({ messages: [...s.messages, { id, kind, text, details }].slice(-MESSAGE_LIMIT) }));
    // Notes go away by themselves; warnings and errors stay until dismissed.
    if (kind === "info" && typeof setTimeout !== "undefined") {
      setTimeout(() => set((s) => ({ messages: s.messages.filter((m) => m.id !== id) })), INFO_MESSAGE_MS);
    }
  },
  dismiss: (id) => set((s) => ({ messages: s.messages.filter((m) => m.id !== id) })),
}));

/** Shortcut for code outside components. */
export function say(kind: Message["kind"], text: string, details?: string[]): void {
  useSession.getState().say(kind, text, details);
}

/** The patch that brings plan tab `id` forward (a new seq, so that asking again works). */
export function planTabPatch(id: string): Pick<SessionState, "planTabRequest"> {
  return { planTabRequest: { id, seq: (useSession.getState().planTabRequest?.seq ?? 0) + 1 } };
}
