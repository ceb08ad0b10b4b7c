import { useEffect, useState } from "react";
import { Link } from "react-router";
import { dateTimeFormat } from "../../shared/local-time";

interface StopWorkItem {
  id: number;
  station: string;
  openedAt: string;
  notifyBy: string;
  reading: { value: number; unit: string; limit: number | null };
  agencyNotified: { at: string; to: string; how: string } | null;
}

interface StandDownItem {
  id: number;
  species: string;
  startedAt: string;
  until: string | null;
}

/** "in 3 h 05 min" or "overdue by 20 min". */
export function countdown(toMs: number, nowMs: number): string {
  const minutes = Math.round((toMs - nowMs) / 60_000);
  const span = Math.abs(minutes);
  const words = span >= 60 ? `${Math.floor(span / 60)} h ${String(span % 60).padStart(2, "0")} min` : `${span} min`;
  return minutes >= 0 ? `in ${words}` : `overdue by ${words}`;
}

export function localTime(iso: string, timeZone: string): string {
  return dateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(new Date(iso));
}

/** How work resumes, for what is in force: a turbidity stop-work, a wildlife stand-down, or both. */
export function resumeRule(stopWorkCount: number, standDownCount: number): string {
  const turbidity = "Turbidity: resume only after an in-limit resample and a recorded resumption.";
  const wildlife = "Wildlife: in-water work resumes only once the animal has left on its own and the permit's wait has passed; never chase or herd it.";
  if (stopWorkCount > 0 && standDownCount > 0) return `${turbidity} ${wildlife}`;
  return stopWorkCount > 0 ? turbidity.replace("Turbidity: resume", "Resume") : wildlife.replace("Wildlife: in-water", "In-water");
}

/**
 * The red banner every project page shows while work is stopped: open turbidity stop-work events
 * with the agency notification deadline counting down, and wildlife stand-downs in force.
 */
export function StopWorkBanner({ projectId, stopWork, standDowns, nowMs, timeZone }: { projectId: number; stopWork: StopWorkItem[]; standDowns: StandDownItem[]; nowMs: number | null; timeZone: string }) {
  // Starts from the server's clock so the first render matches; then ticks every 30 s (the server
  // sends no clock when nothing is in force, and then nothing here is drawn).
  const [now, setNow] = useState(nowMs ?? 0);
  useEffect(() => {
    setNow(Date.now());
    const timer = setInterval(() => setNow(Date.now()), 30_000);
    return () => clearInterval(timer);
  }, [nowMs]);
  if (stopWork.length === 0 && standDowns.length === 0) return null;
  return (
    <div role="alert" data-testid="stop-work-banner" className="mt-3 rounded border-2 border-danger bg-danger p-3 text-white print:hidden">
      {stopWork.map((event) => (
        <p key={`sw-${event.id}`} className="font-semibold">
          STOP WORK — turbidity exceedance at {event.station}: {event.reading.value} {event.reading.unit}
          {event.reading.limit !== null ? ` (limit ${event.reading.limit} ${event.reading.unit})` : ""} since {localTime(event.openedAt, timeZone)}.{" "}
          {event.agencyNotified ? (
            <span className="font-normal">Agency notified {localTime(event.agencyNotified.at, timeZone)} ({event.agencyNotified.how}, {event.agencyNotified.to}).</span>
          ) : (
            <span data-testid="notify-countdown">Notify the agency by {localTime(event.notifyBy, timeZone)} — {countdown(Date.parse(event.notifyBy), now)}.</span>
          )}
        </p>
      ))}
      {standDowns.map((standDown) => (
        <p key={`sd-${standDown.id}`} className="font-semibold">
          IN-WATER STAND-DOWN — {standDown.species} within the shutdown distance since {localTime(standDown.startedAt, timeZone)}.{" "}
          <span className="font-normal">{standDown.until ? `Animal left; work may resume at ${localTime(standDown.until, timeZone)} (${countdown(Date.parse(standDown.until), now)}).` : "Still near: wait until it leaves on its own."}</span>
        </p>
      ))}
      <p className="mt-1 text-sm">
        {resumeRule(stopWork.length, standDowns.length)} <Link to={`/projects/${projectId}/water-quality`} className="underline">Water quality and stand-downs</Link>
      </p>
    </div>
  );
}
