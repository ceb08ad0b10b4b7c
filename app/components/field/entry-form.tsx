import { useState } from "react";
import { CUSTODY_PURPOSES, CUSTODY_PURPOSE_LABELS, FIND_CATEGORIES, FIND_CATEGORY_LABELS, FIND_STATUSES, FIND_STATUS_LABELS, HUMAN_REMAINS_DEFERENCE, HUMAN_REMAINS_PROTOCOL } from "../../../shared/finds/finds";
import { benchStockMillilitres, JAR_CLARITIES, JAR_CLARITY_LABELS } from "../../../shared/dewatering/jar-test";
import { computeShiftFigures, shiftMeasurementsOf, type LoggedShift } from "../../../shared/dewatering/shift";
import { FILLABLE_TUBE_STATUSES, TUBE_STATUSES, type TubeStatus } from "../../../shared/dewatering/tubes";
import type { LengthUnit } from "../../../shared/units";
import { shiftInputSchema } from "~/lib/field-records/inputs";
import { ComputedFigure, formatFigure } from "~/components/dewatering/dewatering-section";
import { NO_DECOMPRESSION_CAUTION } from "../../../shared/no-decompression";
import { STAND_DOWN_CAUTION, WATER_QUALITY_CAUTION } from "../../../shared/water-quality/wording";
import type { FieldSnapshot } from "~/models/field-snapshot";
import { bodyOf, checkBody, ENTRY_LABELS, MAX_JARS, type FormValues } from "./entries";
import { BigCheckbox, BigInput, BigSelect, BigTextArea, bigButton } from "./inputs";
import type { EntryKind, QueuedPhoto } from "./store";

export interface EntryDraft {
  form: FormValues;
  body: Record<string, unknown>;
  photos: QueuedPhoto[];
}

interface EntryFormProps {
  kind: EntryKind;
  snapshot: FieldSnapshot;
  initial: FormValues;
  initialPhotos?: QueuedPhoto[];
  /** Errors the server gave for this entry, by field. */
  serverErrors?: Record<string, string>;
  /** The record is already stored (a find whose photos wait): its fields can no longer change here. */
  locked?: boolean;
  editing: boolean;
  onSave: (draft: EntryDraft) => Promise<void>;
  onCancel?: () => void;
  /** The finds a handover or a status change may name (value: a find's id, or "queued:<entry id>"). */
  findChoices?: Array<{ value: string; label: string }>;
}

/** Handle polymer and slurry lines with care; the shift log's and jar test's cautions name it in full on the online pages. */
const DEWATERING_FIELD_CAUTION = "Polymer is slick and harms eyes and skin: gloves and eye protection, clean a spill at once. Never open a coupling under pressure. Stop filling a tube at the supplier's fill height. The figures are aids, not approval: product and dose follow the permit.";

/** A shift's figures worked out on the device from the entry, with the same functions the server stores them with; null until the entry is complete. */
function shiftFiguresOf(body: Record<string, unknown>, snapshot: FieldSnapshot) {
  if (!snapshot.dewatering || !shiftInputSchema.safeParse(body).success) return null;
  const measured = shiftMeasurementsOf(body as unknown as LoggedShift, snapshot.dewatering.solidsSpecificGravity);
  return measured ? computeShiftFigures(measured, snapshot.project.lengthUnit as LengthUnit) : null;
}

function Caution({ children }: { children: React.ReactNode }) {
  return <p className="rounded border-l-4 border-caution bg-panel px-3 py-2 text-sm">{children}</p>;
}

/** One field entry's form: checked with the server's schema on the device before it joins the queue. */
export function EntryForm({ kind, snapshot, initial, initialPhotos = [], serverErrors = {}, locked = false, editing, onSave, onCancel, findChoices = [] }: EntryFormProps) {
  const [values, setValues] = useState<FormValues>(initial);
  const [photos, setPhotos] = useState<QueuedPhoto[]>(initialPhotos);
  const [errors, setErrors] = useState<Record<string, string>>(serverErrors);
  const [saving, setSaving] = useState(false);
  const unit = snapshot.project.lengthLabel;

  const text = (name: string) => (typeof values[name] === "string" ? (values[name] as string) : "");
  const bind = (name: string) => ({
    name,
    value: text(name),
    error: errors[name],
    disabled: locked,
    onChange: (event: React.ChangeEvent<HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement>) => setValues((current) => ({ ...current, [name]: event.target.value })),
  });
  const check = (name: string) => ({
    name,
    checked: values[name] === true,
    disabled: locked,
    onChange: (event: React.ChangeEvent<HTMLInputElement>) => setValues((current) => ({ ...current, [name]: event.target.checked })),
  });

  async function submit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const body = bodyOf(kind, values);
    const found = locked ? {} : checkBody(kind, body, values, snapshot);
    setErrors(found);
    if (Object.keys(found).length > 0) {
      // Focus the first field in error, so a keyboard or screen-reader user lands on it.
      const form = event.currentTarget;
      requestAnimationFrame(() => form.querySelector<HTMLElement>("[aria-invalid=true]")?.focus());
      return;
    }
    setSaving(true);
    try {
      await onSave({ form: values, body, photos });
    } finally {
      setSaving(false);
    }
  }

  function addPhotos(files: FileList | null) {
    if (!files) return;
    const added = [...files].map((file) => ({ id: crypto.randomUUID(), name: file.name || "photo.jpg", type: file.type, blob: file as Blob }));
    setPhotos((current) => [...current, ...added]);
  }

  const team = snapshot.teams.find((candidate) => String(candidate.id) === text("team"));
  const photoPicker = (
    <fieldset className="space-y-2">
            <legend className="font-medium">Photos (kept on this device until sent)</legend>
            {photos.length ? (
              <ul className="space-y-2">
                {photos.map((photo) => (
                  <li key={photo.id} className="flex items-center justify-between gap-3 rounded border border-line bg-panel px-3 py-2">
                    <span className="break-all">{photo.name} <span className="figures text-sm text-muted">{Math.round(photo.blob.size / 1024)} KB</span>{photo.sentId !== undefined ? " · sent" : ""}</span>
                    {photo.sentId === undefined ? <button type="button" className={bigButton.plain} onClick={() => setPhotos((current) => current.filter((candidate) => candidate.id !== photo.id))}>Remove<span className="sr-only"> {photo.name}</span></button> : null}
                  </li>
                ))}
              </ul>
            ) : null}
            <label className={`${bigButton.plain} inline-flex cursor-pointer items-center focus-within:outline-3 focus-within:outline-lagoon`}>
              Add a photo
              <input type="file" accept="image/jpeg,image/png,image/webp" multiple className="sr-only" onChange={(event) => addPhotos(event.target.files)} />
            </label>
          </fieldset>
  );
  const jarCount = Math.min(MAX_JARS, Number(values.jarCount) || 0);
  // A shift fills only tubes that take slurry (the server refuses the others).
  const fillable = snapshot.tubes.filter((tube) => FILLABLE_TUBE_STATUSES.includes(tube.status as TubeStatus));
  const shiftFigures = kind === "shift" ? shiftFiguresOf(bodyOf("shift", values), snapshot) : null;
  const benchStock = Number(text("benchStockPercent").replace(",", "."));
  const jarVolume = Number(text("jarVolumeMl").replace(",", "."));
  const stockFor = (index: number) => {
    const dose = Number(text(`jar-${index}-dose`).replace(",", "."));
    return benchStock > 0 && jarVolume > 0 && dose > 0 ? `add ${formatFigure(benchStockMillilitres(jarVolume, dose, benchStock), 1)} mL of bench stock` : undefined;
  };
  const heading = `${editing ? "Change" : "New"} ${ENTRY_LABELS[kind].toLowerCase()}`;
  return (
    <form onSubmit={submit} noValidate className="space-y-4" aria-labelledby={`${kind}-form-heading`}>
      <h2 id={`${kind}-form-heading`} className="text-xl font-semibold">{heading}</h2>
      {errors.form ? <p role="alert" className="font-medium text-danger">{errors.form}</p> : null}
      {locked ? <p className="rounded bg-paper px-3 py-2">This record is stored on the server already; only its photos wait. Remove a photo the server refused, then send again.</p> : null}
      {kind === "dive" ? (
        <>
          <Caution>{NO_DECOMPRESSION_CAUTION}</Caution>
          <div className="grid gap-4 sm:grid-cols-2">
            <BigInput label="Day of the dive" type="date" {...bind("date")} />
            <BigSelect label="Team" placeholder="Choose the team" options={snapshot.teams.map((candidate) => ({ value: String(candidate.id), label: candidate.name }))} {...bind("team")} />
            <BigInput label="Diver" list="field-divers" autoComplete="off" hint={team ? `On ${team.name}'s roster: ${team.divers.join(", ") || "nobody yet"}` : undefined} {...bind("diver")} />
            <datalist id="field-divers">{(team?.divers ?? snapshot.teams.flatMap((candidate) => candidate.divers)).map((name) => <option key={name} value={name} />)}</datalist>
            <BigCheckbox label="Visitor (not on the team's roster)" {...check("visitor")} />
            <BigInput label="Left the surface" type="time" hint="With the time the diver left the bottom, or give the bottom time alone." {...bind("leftSurface")} />
            <BigInput label="Left the bottom" type="time" {...bind("leftBottom")} />
            <BigInput label="Bottom time (minutes)" inputMode="numeric" {...bind("bottomMinutes")} />
            <BigInput label={`Maximum depth (${unit})`} inputMode="decimal" {...bind("maxDepth")} />
            <BigInput label="Cells worked" list="field-cells" autoComplete="off" hint="Cell labels separated by spaces, e.g. C4 C5" {...bind("cells")} />
          </div>
          <BigTextArea label="Notes" {...bind("notes")} />
        </>
      ) : null}
      {kind === "reading" ? (
        <>
          <Caution>{WATER_QUALITY_CAUTION}</Caution>
          <div className="grid gap-4 sm:grid-cols-2">
            <BigSelect label="Station" placeholder="Choose the station" options={snapshot.stations.map((station) => ({ value: String(station.id), label: `${station.name} (${station.kind})` }))} {...bind("station")} />
            <BigInput label="Sample taken (this device's clock)" type="datetime-local" {...bind("takenAt")} />
            <BigInput label="Turbidity" inputMode="decimal" {...bind("value")} />
            <BigSelect label="Unit" options={[{ value: "NTU", label: "NTU" }, { value: "FNU", label: "FNU" }]} {...bind("unit")} />
            <BigInput label="Sampled by" autoComplete="name" {...bind("sampledBy")} />
            <BigInput label={`Sample depth (${snapshot.project.lengthLabel})`} inputMode="decimal" {...bind("depth")} />
            <BigInput label="Instrument" {...bind("instrument")} />
            <BigInput label="Last calibration check (this device's clock)" type="datetime-local" {...bind("calibratedAt")} />
            <BigInput label="pH" inputMode="decimal" {...bind("ph")} />
            <BigInput label="DO (mg/L)" inputMode="decimal" {...bind("dissolvedOxygen")} />
            <BigInput label="Temp. (°C)" inputMode="decimal" {...bind("temperature")} />
          </div>
          <BigTextArea label="Note" {...bind("note")} />
          {photoPicker}
        </>
      ) : null}
      {kind === "find" ? (
        <>
          <div className="grid gap-4 sm:grid-cols-2">
            <BigSelect label="Category" placeholder="Choose the category" options={FIND_CATEGORIES.map((category) => ({ value: category, label: FIND_CATEGORY_LABELS[category] }))} {...bind("category")} />
            <BigInput label="Found (this device's clock)" type="datetime-local" {...bind("foundAt")} />
          </div>
          {text("category") === "human-remains" ? (
            <div role="alert" className="rounded border-2 border-danger bg-panel p-3">
              <p className="font-semibold text-danger">Human remains: stop, secure, notify.</p>
              <ol className="mt-2 list-decimal space-y-1 pl-5">{HUMAN_REMAINS_PROTOCOL.map((step) => <li key={step}>{step}</li>)}</ol>
              <p className="mt-2 text-sm">{HUMAN_REMAINS_DEFERENCE}</p>
            </div>
          ) : null}
          <BigTextArea label="Description" {...bind("description")} />
          <div className="grid gap-4 sm:grid-cols-2">
            <BigInput label="Cell" list="field-cells" autoComplete="off" hint={snapshot.heldCells.length ? `Held now: ${snapshot.heldCells.join(", ")}` : undefined} {...bind("cell")} />
            <BigInput label={`Depth below the water surface (${unit})`} inputMode="decimal" {...bind("depthBelowSurface")} />
            <BigInput label="Count" inputMode="numeric" {...bind("count")} />
            <BigInput label="Found by" {...bind("finder")} />
            <BigInput label="Field tag" {...bind("fieldTag")} />
          </div>
          {photoPicker}
        </>
      ) : null}
      {kind === "sighting" ? (
        <>
          <Caution>{STAND_DOWN_CAUTION}</Caution>
          <div className="grid gap-4 sm:grid-cols-2">
            <BigInput label="Species" list="field-species" autoComplete="off" {...bind("species")} />
            <datalist id="field-species">{snapshot.species.map((species) => <option key={species} value={species} />)}</datalist>
            <BigInput label="Seen (this device's clock)" type="datetime-local" {...bind("seenAt")} />
            <BigInput label={`Distance from the work (${unit})`} inputMode="decimal" {...bind("distance")} />
            <BigCheckbox label="The animal has gone" {...check("gone")} />
            <BigInput label="Observer" autoComplete="name" {...bind("observer")} />
          </div>
          <BigTextArea label="Note" {...bind("note")} />
        </>
      ) : null}
      {kind === "tube-fill" ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <BigSelect label="Tube" placeholder="Choose the tube" options={snapshot.tubes.map((tube) => ({ value: String(tube.id), label: `${tube.name} (${tube.status}, ${Math.round(tube.fillLevel * 100)} % full)` }))} {...bind("tube")} />
          <BigInput label="Day of the fill" type="date" {...bind("date")} />
          <BigInput label={`Dry solids (${snapshot.massLabel})`} inputMode="decimal" hint="Estimated dry solids delivered to the tube." {...bind("drySolids")} />
          <BigInput label="Slurry pumped (if metered)" inputMode="decimal" {...bind("slurryVolume")} />
          <BigSelect label="Slurry unit" options={[{ value: "gal", label: "gal" }, { value: "m3", label: "m³" }]} {...bind("slurryUnit")} />
        </div>
      ) : null}
      {kind === "tube-status" ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <BigSelect label="Tube" placeholder="Choose the tube" options={snapshot.tubes.map((tube) => ({ value: String(tube.id), label: `${tube.name} (${tube.status}, ${Math.round(tube.fillLevel * 100)} % full)` }))} {...bind("tube")} />
          <BigSelect label="New status" placeholder="Choose the status" options={TUBE_STATUSES.map((status) => ({ value: status, label: status }))} {...bind("status")} />
        </div>
      ) : null}
      {kind === "find-status" ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <BigSelect label="Find" placeholder="Choose the find" options={findChoices.filter((choice) => /^\d+$/.test(choice.value))} {...bind("find")} />
          <BigSelect label="New status" placeholder="Choose the status" options={FIND_STATUSES.map((status) => ({ value: status, label: FIND_STATUS_LABELS[status] }))} {...bind("status")} />
          {text("status") === "curated" ? <BigInput label="Accession number (the lab's)" {...bind("accessionNumber")} /> : null}
          <BigTextArea label={text("status") === "released" ? "Why it was released and where it went" : "Note"} {...bind("note")} />
        </div>
      ) : null}
      {kind === "custody" ? (
        <>
          <div className="grid gap-4 sm:grid-cols-2">
            <BigSelect label="Find" placeholder="Choose the find" hint="A find entered here and not yet sent can be handed over: the handover is sent after it." options={findChoices} {...bind("find")} />
            <BigSelect label="Purpose" placeholder="Choose the purpose" options={CUSTODY_PURPOSES.map((purpose) => ({ value: purpose, label: CUSTODY_PURPOSE_LABELS[purpose] }))} {...bind("purpose")} />
            <BigInput label="Handed over by" autoComplete="name" {...bind("fromName")} />
            <BigInput label="Received by" {...bind("toName")} />
            <BigInput label="Place it goes to" {...bind("place")} />
            <BigInput label="Handed over (this device's clock)" type="datetime-local" {...bind("handedAt")} />
            <BigInput label="Receiver's name, typed as their signature" {...bind("receiverSignature")} />
          </div>
          <BigTextArea label="Note" {...bind("note")} />
        </>
      ) : null}
      {kind === "shift" ? (
        <>
          <Caution>{DEWATERING_FIELD_CAUTION}</Caution>
          <div className="grid gap-4 sm:grid-cols-3">
            <BigInput label="Day of the shift" type="date" {...bind("date")} />
            <BigInput label="Start" type="time" {...bind("start")} />
            <BigInput label="End" type="time" {...bind("end")} />
          </div>
          <div className="grid gap-4 sm:grid-cols-2">
            <BigInput label="Pump hours" inputMode="decimal" hint="Blank: the whole shift." {...bind("pumpHours")} />
            <BigSelect label="Flow measured as" options={[{ value: "meter", label: "slurry flow (flow meter)" }, { value: "totaliser", label: "totaliser at the start and end" }]} {...bind("flowMode")} />
            {text("flowMode") === "totaliser" ? (
              <>
                <BigInput label="Totaliser at start" inputMode="decimal" {...bind("totaliserStart")} />
                <BigInput label="Totaliser at end" inputMode="decimal" {...bind("totaliserEnd")} />
                <BigSelect label="Totaliser unit" options={[{ value: "gal", label: "US gallons" }, { value: "m3", label: "m³" }]} {...bind("totaliserUnit")} />
              </>
            ) : (
              <>
                <BigInput label="Slurry flow" inputMode="decimal" {...bind("flowValue")} />
                <BigSelect label="Flow unit" options={[{ value: "gpm", label: "gpm (US gallons per minute)" }, { value: "m3/h", label: "m³/h" }]} {...bind("flowUnit")} />
              </>
            )}
            <BigSelect label="Slurry solids measured as" options={[{ value: "cw", label: "percent solids by weight" }, { value: "sg", label: "slurry specific gravity" }]} {...bind("solidsMode")} />
            {text("solidsMode") === "sg" ? <BigInput label="Slurry specific gravity" inputMode="decimal" {...bind("slurrySg")} /> : <BigInput label="Solids by weight (%)" inputMode="decimal" {...bind("solidsPercent")} />}
            <BigInput label="Solids specific gravity (Gs)" inputMode="decimal" hint={snapshot.dewatering ? `Blank: the project's ${snapshot.dewatering.solidsSpecificGravity}.` : undefined} {...bind("solidsSg")} />
          </div>
          <fieldset className="space-y-3 rounded border border-line p-3">
            <legend className="px-1 font-medium">Polymer</legend>
            <div className="grid gap-4 sm:grid-cols-2">
              <BigInput label="Product" {...bind("polymerProduct")} />
              <BigInput label="Lot" {...bind("polymerLot")} />
              <BigInput label="Stock concentration (%)" inputMode="decimal" hint="0.5 % = 5 g per litre" {...bind("stockPercent")} />
              <BigInput label="Dose (mg/L)" inputMode="decimal" {...bind("dose")} />
            </div>
          </fieldset>
          <section aria-label="Computed figures" className="rounded border border-line bg-paper p-3">
            <h3 className="font-semibold">Worked out from the entry</h3>
            {shiftFigures === null ? <p className="mt-1 text-muted">Give the times and the slurry flow to see the figures.</p> : (
              <dl className="mt-1">
                <ComputedFigure term="Stock solution feed rate" testId="field-stock-feed-rate" value={formatFigure(shiftFigures.stockFeedRate?.value, 1)} unit={shiftFigures.stockFeedRate?.label ?? ""} formula={shiftFigures.stockFeedRate?.formula ?? "needs a dose and a stock concentration"} />
                <ComputedFigure term="Neat polymer for the shift" value={formatFigure(shiftFigures.neatPolymerForShift?.value, 1)} unit={shiftFigures.neatPolymerForShift?.label ?? ""} formula={shiftFigures.neatPolymerForShift?.formula ?? "needs a dose"} />
                <ComputedFigure term="Dry solids for the shift" value={formatFigure(shiftFigures.drySolids?.value, 1)} unit={shiftFigures.drySolids?.label ?? ""} formula={shiftFigures.drySolids?.formula ?? "needs the slurry's solids"} />
                <ComputedFigure term="Polymer per dry ton" value={formatFigure(shiftFigures.polymerPerDryTon?.value, 2)} unit={shiftFigures.polymerPerDryTon?.label ?? ""} formula={shiftFigures.polymerPerDryTon?.formula ?? "needs a dose and the slurry's solids"} />
              </dl>
            )}
          </section>
          {fillable.length > 0 ? (
            <fieldset className="rounded border border-line p-3">
              <legend className="px-1 font-medium">Tubes being filled</legend>
              <div className="grid gap-1 sm:grid-cols-2">
                {fillable.map((tube) => <BigCheckbox key={tube.id} label={`${tube.name} (${tube.status})`} {...check(`tube:${tube.name}`)} />)}
              </div>
              <p className="text-sm text-muted">The shift's slurry and dry solids are shared equally among the tubes ticked.</p>
              {errors.tubes ? <p className="font-medium text-danger">{errors.tubes}</p> : null}
            </fieldset>
          ) : null}
          <BigTextArea label="Notes" {...bind("notes")} />
        </>
      ) : null}
      {kind === "jar-test" ? (
        <>
          <Caution>{DEWATERING_FIELD_CAUTION}</Caution>
          <div className="grid gap-4 sm:grid-cols-2">
            <BigInput label="Day of the test" type="date" {...bind("date")} />
            <BigInput label="Time" type="time" {...bind("time")} />
            <BigInput label="Sample drawn from" {...bind("sampleSource")} />
            <BigInput label="Polymer product" {...bind("polymerProduct")} />
            <BigInput label="Lot" {...bind("polymerLot")} />
            <BigInput label="Bench stock (%)" inputMode="decimal" hint="0.1 % = 1 g per litre = 1 mg per mL" {...bind("benchStockPercent")} />
            <BigInput label="Jar volume (mL)" inputMode="decimal" {...bind("jarVolumeMl")} />
            <BigInput label="Raw sample turbidity (NTU)" inputMode="decimal" hint="The undosed jar, if measured." {...bind("rawNtu")} />
            <BigInput label="Settling time (min)" inputMode="decimal" hint="The same for every jar." {...bind("settlingMinutes")} />
          </div>
          {errors.jars ? <p className="font-medium text-danger">{errors.jars}</p> : null}
          {Array.from({ length: jarCount }, (_, index) => (
            <fieldset key={index} className="rounded border border-line p-3">
              <legend className="px-1 font-medium">Jar {index + 1}</legend>
              <div className="grid gap-4 sm:grid-cols-3">
                <BigInput label="Dose (mg/L)" inputMode="decimal" hint={stockFor(index)} {...bind(`jar-${index}-dose`)} />
                <BigInput label="NTU after settling" inputMode="decimal" {...bind(`jar-${index}-ntu`)} />
                <BigSelect label="Clarity" placeholder="Choose" options={JAR_CLARITIES.map((clarity) => ({ value: clarity, label: JAR_CLARITY_LABELS[clarity] }))} {...bind(`jar-${index}-clarity`)} />
              </div>
            </fieldset>
          ))}
          {jarCount < MAX_JARS && !locked ? <button type="button" className={bigButton.plain} onClick={() => setValues((current) => ({ ...current, jarCount: String(jarCount + 1) }))}>Add a jar</button> : null}
          <BigInput label="Dose chosen (mg/L)" inputMode="decimal" hint="Blank when no jar was good enough." {...bind("chosenDose")} />
          <BigTextArea label="Notes" {...bind("notes")} />
          {photoPicker}
        </>
      ) : null}
      {kind === "haul" ? (
        <>
          <div className="grid gap-4 sm:grid-cols-2">
            <BigInput label="Day of the haul" type="date" {...bind("date")} />
            <BigInput label="Ticket number" autoComplete="off" {...bind("ticketNumber")} />
            <BigInput label="Truck" {...bind("truck")} />
            <BigSelect label="Destination" placeholder="Choose the destination" options={(snapshot.dewatering?.haulSites ?? []).map((site) => ({ value: String(site.id), label: `${site.name} (${site.kind})` }))} {...bind("site")} />
            <BigInput label="Load" inputMode="decimal" {...bind("loadValue")} />
            <BigSelect label="Load unit" options={[{ value: "short-ton", label: "short tons (scale ticket)" }, { value: "t", label: "tonnes (scale ticket)" }, { value: "yd3", label: "yd³ (truck body)" }, { value: "m3", label: "m³ (truck body)" }]} {...bind("loadUnit")} />
            <BigInput label="Cake solids (%)" inputMode="decimal" hint={snapshot.dewatering?.cakeSolidsByWeight == null ? "From the load's sample (the project has no default)." : `Blank: the project default, ${formatFigure(snapshot.dewatering.cakeSolidsByWeight * 100, 1)} %.`} {...bind("cakeSolidsPercent")} />
          </div>
          <BigTextArea label="Notes" {...bind("notes")} />
          {photoPicker}
        </>
      ) : null}
      <datalist id="field-cells">{snapshot.cells.slice(0, 2000).map((label) => <option key={label} value={label} />)}</datalist>
      <div className="flex flex-wrap gap-3">
        <button type="submit" className={bigButton.primary} disabled={saving}>{saving ? "Saving…" : editing ? "Save changes" : "Save to the queue"}</button>
        {onCancel ? <button type="button" className={bigButton.plain} onClick={onCancel}>Cancel</button> : null}
      </div>
    </form>
  );
}
