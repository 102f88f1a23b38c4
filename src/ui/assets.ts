/**
 * Binary assets of the plan that do not belong in the plan document: the DEM file bytes. Kept beside
 * the plan in memory and in IndexedDB (autosave.ts), and bundled with the plan in a .zip (files.ts).
 */
import { create } from "zustand";

export interface DemAsset {
  /** File name as the plan refers to it (terrain.ground.file). */
  fileName: string;
  bytes: ArrayBuffer;
}

export interface AssetState {
  dem: DemAsset | null;
  setDem: (dem: DemAsset | null) => void;
}

export const useAssets = create<AssetState>()((set) => ({
  dem: null,
  setDem: (dem) => set({ dem }),
}));
