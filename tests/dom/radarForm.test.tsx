// @vitest-environment jsdom
import fc from "fast-check";
import { act } from "react";
import { createRoot, type Root } from "react-dom/client";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import pulsed from "../../demo-sites/radars/kalvori-x9-rotating-pulsed.json";
import patchFmcw from "../../demo-sites/radars/mossbee-58-patch-fmcw.json";
import staringFmcw from "../../demo-sites/radars/zorvane-s24-staring-fmcw.json";
import type { RadarModel } from "../../src/coverage/radarModel";
import { parseRadarModel } from "../../src/io/radarSchema";
import { importedRadarModel, NEW_RADAR_MODEL_NAME, newRadarModel } from "../../src/ui/newRadarModel";
import { RadarsPanel } from "../../src/ui/panels/RadarsPanel";
import { derivedFigures } from "../../src/ui/panels/radarForm/derivedFigures";
import {
  candidateFromDraft,
  draftFromModel,
  messageInUnit,
  routeErrors,
  siToText,
  textToSi,
  UNITS,
} from "../../src/ui/panels/radarForm/formModel";
import { checkDraft, RadarModelForm } from "../../src/ui/panels/radarForm/RadarModelForm";
import { undo, usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

/** The file the mocked picker returns next. */
const picked: { file: File | null } = { file: null };
vi.mock("browser-fs-access", () => ({
  fileOpen: async () => {
    if (!picked.file) throw new Error("cancelled");
    return picked.file;
  },
  fileSave: async () => undefined,
}));

const MODELS = [pulsed, patchFmcw, staringFmcw] as RadarModel[];
const REQUIREMENT = { requiredPd: 0.9, pfa: 1e-6, looks: 1 };

describe("radar form units (display at the edge, SI in the model)", () => {
  it("shows SI values in the display unit of the field", () => {
    expect(siToText(9.4e9, UNITS.ghz)).toBe("9.4");
    expect(siToText(1e-6, UNITS.us)).toBe("1");
    expect(siToText(2.5e-7, UNITS.us)).toBe("0.25");
    expect(siToText(2e7, UNITS.mhz)).toBe("20");
    expect(siToText(1e4, UNITS.khz)).toBe("10");
    expect(siToText(12_000, UNITS.km)).toBe("12");
    expect(siToText(undefined, UNITS.w)).toBe("");
  });

  it("reads typed text back to SI: empty is absent, a decimal comma is accepted, words are NaN", () => {
    expect(textToSi("9.4", UNITS.ghz)).toBe(9.4e9);
    expect(textToSi(" 0,25 ", UNITS.us)).toBe(2.5e-7);
    expect(textToSi("24.125", UNITS.ghz)).toBe(24.125e9);
    expect(textToSi("", UNITS.mhz)).toBeUndefined();
    expect(textToSi("abc", UNITS.w)).toBeNaN();
  });

  it("round-trips any value through the text of every unit to 1e-11 relative", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-9, max: 1e11, noNaN: true }),
        fc.constantFrom(...Object.values(UNITS)),
        (v, u) => {
          const back = textToSi(siToText(v, u), u) as number;
          expect(Math.abs(back - v)).toBeLessThanOrEqual(Math.abs(v) * 1e-11);
        },
      ),
    );
  });

  it("a draft of each demo model validates back to exactly that model", () => {
    for (const m of MODELS) {
      const r = checkDraft(m, draftFromModel(m));
      expect(r.ok ? r.model : r.errors).toEqual(m);
    }
  });
});

describe("radar form errors go beside the field their path names", () => {
  it("routes by the longest matching path; others are kept apart", () => {
    const { byPath, other } = routeErrors([
      { path: "transmitter.peakPowerW", message: "must be > 0 W (got -5)" },
      { path: "txAntenna.azCut.angleDeg[3]", message: "3 deg does not follow 4 deg" },
      { path: "waveform.pulseWidthS", message: "duty cycle of 2 (must be ≤ 1)" },
      { path: "(file)", message: "broken" },
    ]);
    expect(byPath.get("transmitter.peakPowerW")).toEqual(["must be > 0 W (got -5)"]);
    expect(byPath.get("txAntenna.azCut")).toEqual(["angleDeg[3]: 3 deg does not follow 4 deg"]);
    expect(byPath.get("waveform.pulseWidthS")).toHaveLength(1);
    expect(other).toEqual([{ path: "(file)", message: "broken" }]);
  });

  it("restates the schema's SI numbers in the field's display unit", () => {
    expect(messageInUnit("2000000 is below the 3000000 Hz limit", UNITS.ghz)).toBe(
      "0.002 GHz is below the 0.003 GHz limit",
    );
    expect(messageInUnit("must be > 0 s (got -5e-7)", UNITS.us)).toBe("must be > 0 µs (got -0.5 µs)");
    expect(messageInUnit("is required (a number in Hz)", UNITS.mhz)).toBe("is required (a number in MHz)");
    expect(messageInUnit("0.00002 s at 100000 Hz is a duty cycle of 2.00 (must be ≤ 1)", UNITS.us)).toBe(
      "20 µs at 100000 Hz is a duty cycle of 2.00 (must be ≤ 1)",
    );
    expect(messageInUnit("100 m is not beyond the blind zone, blindZoneM (150 m)", UNITS.km)).toBe(
      "0.1 km is not beyond the blind zone, blindZoneM (0.15 km)",
    );
    expect(messageInUnit("must be > 0 W (got -5)", UNITS.w)).toBe("must be > 0 W (got -5)");
    // Beside the field, through the error routing.
    const { byPath } = routeErrors([
      { path: "frequencyHz", message: "5e11 is above the 300000000000 Hz limit" },
    ]);
    expect(byPath.get("frequencyHz")).toEqual(["500 GHz is above the 300 GHz limit"]);
  });

  it("switching to FMCW with no FMCW values names each missing field", () => {
    const d = draftFromModel(pulsed as RadarModel);
    d.texts["waveform.kind"] = "fmcw";
    const r = checkDraft(pulsed as RadarModel, d);
    expect(r.ok).toBe(false);
    const paths = r.ok ? [] : r.errors.map((e) => e.path);
    expect(paths).toEqual(
      expect.arrayContaining([
        "waveform.chirpBandwidthHz",
        "waveform.chirpDurationS",
        "waveform.ifSampleRateHz",
      ]),
    );
    // The pulsed fields are not sent with an FMCW waveform.
    expect(candidateFromDraft(pulsed as RadarModel, d).json.waveform).not.toHaveProperty("pulseWidthS");
  });
});

describe("derived figures come from the coverage functions", () => {
  it("match hand calculations for the pulsed demo model", () => {
    const f = derivedFigures(pulsed as RadarModel, REQUIREMENT);
    // ΔR = c/(2B), B = 20 MHz (common practice): 299792458 / 4e7 = 7.4948 m.
    expect(f.rangeResolutionM).toBeCloseTo(7.4948, 3);
    // Duty = τ·PRF = 1 µs · 10 kHz = 0.01; P_av = 1000 W · 0.01 = 10 W (common practice).
    expect(f.dutyCycle).toBeCloseTo(0.01, 12);
    expect(f.averagePowerW).toBeCloseTo(10, 9);
    // Blind zone at least c·τ/2 = 149.9 m (common practice).
    expect(f.blindZoneM).toBeGreaterThanOrEqual(149.89);
    expect(f.fmcwMaxRangeM).toBeNaN();
    // Free-space range grows as P^(1/4) (radar equation): 16× the power doubles it.
    const strong = { ...pulsed, transmitter: { peakPowerW: 16_000 } } as RadarModel;
    expect(derivedFigures(strong, REQUIREMENT).freeSpaceRangeM / f.freeSpaceRangeM).toBeCloseTo(2, 9);
  });
});

let root: Root;
let host: HTMLDivElement;

function render(node: React.ReactNode) {
  act(() => root.render(node));
}

/** The input a visible label is tied to (label htmlFor → id). */
function inputByLabel(text: string): HTMLInputElement | HTMLSelectElement {
  const label = [...host.querySelectorAll("label")].find((l) => l.textContent?.startsWith(text));
  if (!label) throw new Error(`no label "${text}"`);
  const el = document.getElementById(label.htmlFor);
  if (!el) throw new Error(`label "${text}" is tied to no input`);
  return el as HTMLInputElement;
}

function type(el: HTMLInputElement | HTMLSelectElement, value: string) {
  const proto = el instanceof HTMLSelectElement ? HTMLSelectElement.prototype : HTMLInputElement.prototype;
  act(() => {
    el.focus();
    Object.getOwnPropertyDescriptor(proto, "value")?.set?.call(el, value);
    el.dispatchEvent(new Event(el instanceof HTMLSelectElement ? "change" : "input", { bubbles: true }));
  });
}

function blur(el: HTMLElement) {
  act(() => el.blur());
}

beforeEach(() => {
  host = document.createElement("div");
  document.body.appendChild(host);
  root = createRoot(host);
});
afterEach(() => {
  act(() => root.unmount());
  host.remove();
});

describe("radar form in the DOM", () => {
  it("converts at the edge, shows errors beside the field and keeps the typing", () => {
    const applied: RadarModel[] = [];
    const model = pulsed as RadarModel;
    render(<RadarModelForm model={model} requirement={REQUIREMENT} onApply={(m) => applied.push(m)} />);
    const freq = inputByLabel("Carrier frequency") as HTMLInputElement;
    expect(freq.value).toBe("9.4");
    expect(freq.nextElementSibling?.textContent).toBe("GHz");
    expect((inputByLabel("Pulse width") as HTMLInputElement).value).toBe("1");
    type(freq, "9.6");
    blur(freq);
    expect(applied.at(-1)?.frequencyHz).toBe(9.6e9);

    const power = inputByLabel("Peak power") as HTMLInputElement;
    type(power, "-5");
    blur(power);
    const err = host.querySelector('[data-testid="rf-error-transmitter.peakPowerW"]');
    expect(err?.textContent).toMatch(/must be > 0 W/);
    expect(power.getAttribute("aria-describedby")).toBe(err?.id);
    expect(power.value).toBe("-5");
    expect(applied).toHaveLength(1);

    type(power, "lots");
    blur(power);
    expect(err?.isConnected ? err.textContent : "").toMatch(/"lots" is not a number/);
    expect(applied).toHaveLength(1);

    type(power, "2000");
    blur(power);
    expect(applied).toHaveLength(2);
    expect(applied[1].transmitter.peakPowerW).toBe(2000);
    expect(host.querySelector('[data-testid="rf-error-transmitter.peakPowerW"]')).toBeNull();

    const pw = inputByLabel("Pulse width") as HTMLInputElement;
    type(pw, "0.5");
    blur(pw);
    expect(applied.at(-1)?.waveform).toMatchObject({ kind: "pulsed", pulseWidthS: 5e-7 });
  });

  it("shows only the chosen waveform's fields and the receive antenna only when it differs", () => {
    render(
      <RadarModelForm model={pulsed as RadarModel} requirement={REQUIREMENT} onApply={() => undefined} />,
    );
    expect(() => inputByLabel("Chirp bandwidth")).toThrow();
    type(inputByLabel("Kind"), "fmcw");
    expect(() => inputByLabel("Pulse width")).toThrow();
    expect(inputByLabel("Chirp bandwidth").value).toBe("");
    expect(host.querySelector('[data-testid="rf-error-waveform.chirpBandwidthHz"]')?.textContent).toMatch(
      /is required/,
    );
    const rxSame = host.querySelector('[data-testid="rf-rx-same"]') as HTMLInputElement;
    expect(rxSame.checked).toBe(true);
    expect([...host.querySelectorAll("label")].filter((l) => l.textContent === "Peak gain")).toHaveLength(1);
    act(() => rxSame.click());
    expect([...host.querySelectorAll("label")].filter((l) => l.textContent === "Peak gain")).toHaveLength(2);
  });

  it("applies through the store as one undo step per change; undo shows the old value", () => {
    usePlanStore.getState().load(samplePlan());
    render(<RadarsPanel />);
    const edit = [...host.querySelectorAll("button")].find((b) => b.textContent === "Edit");
    act(() => edit?.click());
    const power = inputByLabel("Peak power") as HTMLInputElement;
    const before = host.querySelector('[data-testid="rf-d-range"]')?.textContent;
    type(power, "16000");
    blur(power);
    expect(usePlanStore.temporal.getState().pastStates).toHaveLength(1);
    expect(usePlanStore.getState().plan?.radarModels[0].transmitter.peakPowerW).toBe(16_000);
    expect(host.querySelector('[data-testid="rf-d-range"]')?.textContent).not.toBe(before);
    type(power, "0");
    blur(power);
    expect(usePlanStore.temporal.getState().pastStates).toHaveLength(1);
    // Escape closes the form; opening it again finds the typing (and its error) still there.
    act(() => power.dispatchEvent(new KeyboardEvent("keydown", { key: "Escape", bubbles: true })));
    expect((host.querySelector('[data-testid="radar-form"]') as HTMLElement).hidden).toBe(true);
    act(() => edit?.click());
    expect((inputByLabel("Peak power") as HTMLInputElement).value).toBe("0");
    expect(host.querySelector('[data-testid="rf-error-transmitter.peakPowerW"]')?.textContent).toMatch(
      /> 0 W/,
    );
    act(() => {
      undo();
    });
    expect((inputByLabel("Peak power") as HTMLInputElement).value).toBe("1000");
    expect(host.querySelector('[data-testid="rf-d-range"]')?.textContent).toBe(before);
    const m = usePlanStore.getState().plan?.radarModels[0];
    expect(parseRadarModel(m).ok).toBe(true);
  });

  it("adds a new model with valid starting figures, opens it for editing, names its users; undo removes it", () => {
    const plan = samplePlan();
    usePlanStore.getState().load(plan);
    render(<RadarsPanel />);
    const users = () => host.querySelector('[data-testid="model-users"]')?.textContent ?? "";
    const firstUsers = plan.posts.filter((p) => p.radarModelId === plan.radarModels[0].id).map((p) => p.name);
    expect(firstUsers.length).toBeGreaterThan(0);
    expect(users()).toBe(`Used by ${firstUsers.join(", ")}.`);
    const n = plan.radarModels.length;
    const add = [...host.querySelectorAll("button")].find((b) => b.textContent === "New model");
    act(() => add?.click());
    const models = usePlanStore.getState().plan?.radarModels ?? [];
    expect(models).toHaveLength(n + 1);
    const m = models[n];
    expect(m.name).toBe(NEW_RADAR_MODEL_NAME);
    expect(models.filter((x) => x.id === m.id)).toHaveLength(1);
    // The starting figures pass the same schema as an imported model file, and are the user's, not an example.
    expect(parseRadarModel(m)).toEqual({ ok: true, model: m });
    expect(m.invented).toBeUndefined();
    expect(host.querySelector("h3")?.textContent).toBe(NEW_RADAR_MODEL_NAME);
    expect((host.querySelector('[data-testid="radar-form"]') as HTMLElement).hidden).toBe(false);
    expect(users()).toBe("No post uses this model.");
    const del = [...host.querySelectorAll("button")].find(
      (b) => b.textContent === "Delete",
    ) as HTMLButtonElement;
    expect(del.disabled).toBe(false);
    act(() => {
      undo();
    });
    expect(usePlanStore.getState().plan?.radarModels).toHaveLength(n);
  });

  it("imports a pattern cut per plane from CSV; a bad file lists its errors and keeps the cut in use", async () => {
    const applied: RadarModel[] = [];
    render(
      <RadarModelForm
        model={pulsed as RadarModel}
        requirement={REQUIREMENT}
        onApply={(m) => applied.push(m)}
      />,
    );
    const buttons = () =>
      [...host.querySelectorAll("button")].filter((b) => b.textContent === "Import pattern cut (CSV)…");
    expect(buttons()).toHaveLength(2);
    picked.file = new File(["angle_deg,gain_db\n-10,-20\n0,0\n10,-21\n"], "az.csv", { type: "text/csv" });
    await act(async () => buttons()[0].click());
    expect(applied.at(-1)?.txAntenna.azCut).toEqual({
      angleDeg: [-10, 0, 10],
      relativeGainDb: [-20, 0, -21],
    });
    expect(host.textContent).toMatch(/Azimuth pattern: measured cut, 3 points, -10° to 10°/);
    picked.file = new File(["angle_deg,gain_db\n-10,-20\nfive,0\n"], "bad.csv", { type: "text/csv" });
    await act(async () => buttons()[0].click());
    expect(host.textContent).toMatch(/bad\.csv: row 3, column "angle_deg": "five" is not a number/);
    expect(host.textContent).toMatch(/Not imported; the pattern in use is unchanged/);
    expect(host.textContent).toMatch(/measured cut, 3 points/);
    expect(applied).toHaveLength(1);
    // Absolute gains (dBi) are normalised with a warning shown.
    picked.file = new File(["-5;28\n0;30\n5;27,5\n"], "el.csv", { type: "text/csv" });
    await act(async () => buttons()[1].click());
    expect(applied.at(-1)?.txAntenna.elCut?.relativeGainDb).toEqual([-2, 0, -2.5]);
    expect(host.textContent).toMatch(/el\.csv: gains were normalised/);
  });
});

describe("a radar model file imported into the library", () => {
  it("keeps a new model as it is; one whose id is taken gets a new id, and a name apart if that is taken too", () => {
    const existing = [newRadarModel([])];
    const other = { ...existing[0], id: "other-model", name: "Other" };
    expect(importedRadarModel(existing, other)).toBe(other);
    const again = importedRadarModel(existing, structuredClone(existing[0]));
    expect(again.id).not.toBe(existing[0].id);
    expect(again.name).toBe(`${NEW_RADAR_MODEL_NAME} (imported)`);
    const renamed = importedRadarModel(existing, { ...existing[0], name: "Bench copy" });
    expect(renamed.name).toBe("Bench copy");
    expect(renamed.id).not.toBe(existing[0].id);
  });
});
