import { useState } from "react";
import { FIND_CATEGORIES, FIND_CATEGORY_LABELS, HUMAN_REMAINS_DEFERENCE, HUMAN_REMAINS_PROTOCOL } from "../../../shared/finds/finds";
import { TUBE_STATUSES } from "../../../shared/dewatering/tubes";
import { NO_DECOMPRESSION_CAUTION } from "../../../shared/no-decompression";
import { STAND_DOWN_CAUTION, WATER_QUALITY_CAUTION } from "../../../shared/water-quality/wording";
import type { FieldSnapshot } from "~/models/field-snapshot";
import { bodyOf, checkBody, ENTRY_LABELS, type FormValues } from "./entries";
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
}

function Caution({ children }: { children: React.ReactNode }) {
  return <p className="rounded border-l-4 border-caution bg-panel px-3 py-2 text-sm">{children}</p>;
}

/** One field entry's form: checked with the server's schema on the device before it joins the queue. */
export function EntryForm({ kind, snapshot, initial, initialPhotos = [], serverErrors = {}, locked = false, editing, onSave, onCancel }: EntryFormProps) {
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
    const found = locked ? {} : checkBody(kind, body, values);
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
          </div>
          <BigTextArea label="Note" {...bind("note")} />
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
      <datalist id="field-cells">{snapshot.cells.slice(0, 2000).map((label) => <option key={label} value={label} />)}</datalist>
      <div className="flex flex-wrap gap-3">
        <button type="submit" className={bigButton.primary} disabled={saving}>{saving ? "Saving…" : editing ? "Save changes" : "Save to the queue"}</button>
        {onCancel ? <button type="button" className={bigButton.plain} onClick={onCancel}>Cancel</button> : null}
      </div>
    </form>
  );
}
