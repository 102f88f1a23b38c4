/** The planner's layout: top bar; plan panels on the left; the map; results and inspection on the right. */
import { useCallback, useRef, useState } from "react";
import type L from "../map/leaflet";
import { AboutDialog } from "./components/AboutDialog";
import { FirstRunHint } from "./components/FirstRunHint";
import { MapView } from "./components/MapView";
import { Messages } from "./components/Messages";
import { Tabs } from "./components/Tabs";
import { TopBar } from "./components/TopBar";
import { AnalysisPanel } from "./panels/AnalysisPanel";
import { InspectPanel } from "./panels/InspectPanel";
import { PostsPanel } from "./panels/PostsPanel";
import { RadarsPanel } from "./panels/RadarsPanel";
import { ResultsPanel } from "./panels/ResultsPanel";
import { SitePanel } from "./panels/SitePanel";
import { TargetsPanel } from "./panels/TargetsPanel";
import { useSession } from "./session";

const PLAN_TABS = [
  { id: "posts", label: "Posts", render: () => <PostsPanel /> },
  { id: "site", label: "Site", render: () => <SitePanel /> },
  { id: "radars", label: "Radars", render: () => <RadarsPanel /> },
  { id: "targets", label: "Targets", render: () => <TargetsPanel /> },
  { id: "analysis", label: "Analysis", render: () => <AnalysisPanel /> },
];

const RESULT_TABS = [
  { id: "results", label: "Coverage", render: () => <ResultsPanel /> },
  { id: "inspect", label: "Inspect", render: () => <InspectPanel /> },
];

export function App() {
  const planTabRequest = useSession((s) => s.planTabRequest);
  const [aboutOpen, setAboutOpen] = useState(false);
  const mapRef = useRef<L.Map | null>(null);
  const onMap = useCallback((m: L.Map | null) => {
    mapRef.current = m;
  }, []);
  const centre = useCallback((): [number, number] => {
    const c = mapRef.current?.getCenter();
    return c ? [c.lng, c.lat] : [15.3, 47.1];
  }, []);
  return (
    <div className="app">
      <TopBar onAbout={() => setAboutOpen(true)} mapCentre={centre} />
      <main className="workspace">
        <aside className="side side-left" aria-label="Plan">
          <Tabs tabs={PLAN_TABS} label="Plan" testId="plan-tabs" request={planTabRequest} />
        </aside>
        <MapView onMap={onMap} initialCentre={[47.1, 15.3]} />
        <aside className="side side-right" aria-label="Results">
          <Tabs tabs={RESULT_TABS} label="Results" testId="result-tabs" />
        </aside>
      </main>
      <Messages />
      <FirstRunHint />
      <AboutDialog open={aboutOpen} onClose={() => setAboutOpen(false)} />
    </div>
  );
}
