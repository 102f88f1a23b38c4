/** What the group components of the radar-model form read and call: the draft, its errors, its edits. */
import { createContext, useContext } from "react";
import type { PatternCut } from "../../../coverage/radarModel";
import type { CutPath, RadarDraft } from "./formModel";

export interface RadarFormApi {
  draft: RadarDraft;
  /** Error messages by model path (see routeErrors). */
  errors: ReadonlyMap<string, string[]>;
  /** Changes the typed text of a field without applying it. */
  setText: (path: string, text: string) => void;
  /** Applies the draft to the plan when it validates; otherwise shows its errors. */
  commit: () => void;
  /** Sets a choice (select) and applies. */
  choose: (path: string, value: string) => void;
  setRxSame: (same: boolean) => void;
  /** Sets or removes a measured cut and applies. */
  setCut: (path: CutPath, cut: PatternCut | undefined) => void;
}

export const RadarFormContext = createContext<RadarFormApi | null>(null);

export function useRadarForm(): RadarFormApi {
  const api = useContext(RadarFormContext);
  if (!api) throw new Error("useRadarForm outside RadarModelForm");
  return api;
}
