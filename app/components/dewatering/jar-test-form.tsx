import { useState } from "react";
import { Form } from "react-router";
import { DEFAULT_JAR_VOLUME_ML, JAR_CLARITIES, JAR_CLARITY_LABELS, benchStockMillilitres, jarTestFigures, turbidityRemoval, type JarClarity } from "../../../shared/dewatering/jar-test";
import type { FieldErrors } from "~/lib/http/form";
import { SubmitButton } from "../submit-button";
import { FieldInput, FieldSelect, formatFigure } from "./dewatering-section";

/**
 * The jar test form, phone first: the bench set-up, the raw sample, one small block per dosed jar
 * (dose, turbidity if measured, clarity by eye) with the bench stock to add worked out as the
 * operator types (shared/dewatering/jar-test.ts, as the server answers it), the dose chosen and a
 * photo of the jars.
 */

export const MAX_JARS = 8;
const numberOf = (text: string) => (text.trim() === "" ? null : Number(text));

interface JarRow {
  dose: string;
  ntu: string;
  clarity: string;
}

export function JarTestForm(props: { defaultDate: string; errors: FieldErrors; photoMaxMegabytes: number }) {
  const [values, setValues] = useState({ benchStockPercent: "0.1", jarVolumeMl: String(DEFAULT_JAR_VOLUME_ML), rawNtu: "", settlingMinutes: "10", chosenDose: "" });
  const [jars, setJars] = useState<JarRow[]>([{ dose: "", ntu: "", clarity: "" }, { dose: "", ntu: "", clarity: "" }, { dose: "", ntu: "", clarity: "" }]);
  const change = (event: React.ChangeEvent<HTMLInputElement>) => setValues((old) => ({ ...old, [event.target.name]: event.target.value }));
  const changeJar = (index: number, key: keyof JarRow) => (event: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) =>
    setJars((old) => old.map((jar, at) => (at === index ? { ...jar, [key]: event.target.value } : jar)));

  const stock = numberOf(values.benchStockPercent);
  const volume = numberOf(values.jarVolumeMl);
  const raw = numberOf(values.rawNtu);
  const usable = stock !== null && stock > 0 && volume !== null && volume > 0;
  // The pointer to the clearest jar needs the set-up and at least one jar with a dose and a clarity.
  const dosed = jars.map((jar) => ({ dose: numberOf(jar.dose), ntu: numberOf(jar.ntu), clarity: jar.clarity }));
  const complete = dosed.filter((jar): jar is { dose: number; ntu: number | null; clarity: JarClarity } => jar.dose !== null && jar.dose > 0 && (JAR_CLARITIES as readonly string[]).includes(jar.clarity));
  const figures = usable && complete.length > 0
    ? jarTestFigures({ jarVolumeMl: volume, benchStockPercent: stock, rawTurbidityNtu: raw !== null && raw > 0 ? raw : null, jars: complete.map((jar) => ({ doseMgPerL: jar.dose, settlingMinutes: 1, turbidityNtu: jar.ntu, clarity: jar.clarity })) })
    : null;
  const errors = props.errors;

  return (
    <Form method="post" encType="multipart/form-data" className="space-y-4" aria-label="Record a jar test">
      <div className="grid gap-3 sm:grid-cols-3">
        <FieldInput label="Date" name="date" type="date" required defaultValue={props.defaultDate} error={errors.date} />
        <FieldInput label="Time" name="time" type="time" error={errors.time} />
        <FieldInput label="Sample drawn from" name="sampleSource" placeholder="main line at the tube manifold" error={errors.sampleSource} />
      </div>
      <fieldset className="space-y-3 rounded border border-line p-3">
        <legend className="px-1 text-sm font-medium">Polymer and bench set-up</legend>
        <div className="grid gap-3 sm:grid-cols-2">
          <FieldInput label="Product" name="polymerProduct" required error={errors.polymerProduct} />
          <FieldInput label="Lot" name="polymerLot" error={errors.polymerLot} />
          <FieldInput label="Bench stock (%)" name="benchStockPercent" inputMode="decimal" required value={values.benchStockPercent} onChange={change} error={errors.benchStockPercent} hint="0.1 % = 1 g per litre = 1 mg per mL" />
          <FieldInput label="Jar volume (mL)" name="jarVolumeMl" inputMode="decimal" required value={values.jarVolumeMl} onChange={change} error={errors.jarVolumeMl} />
          <FieldInput label="Raw sample turbidity (NTU)" name="rawNtu" inputMode="decimal" value={values.rawNtu} onChange={change} error={errors.rawNtu} hint="the undosed jar, if measured" />
          <FieldInput label="Settling time (min)" name="settlingMinutes" inputMode="decimal" required value={values.settlingMinutes} onChange={change} error={errors.settlingMinutes} hint="the same for every jar" />
        </div>
      </fieldset>
      <fieldset className="space-y-3 rounded border border-line p-3">
        <legend className="px-1 text-sm font-medium">Dosed jars</legend>
        <p className="text-xs text-muted">Bench stock per jar = jar volume (mL) × dose (mg/L) ÷ stock (% × 10,000 mg/L). A jar left blank is not recorded.</p>
        {errors.jars ? <p className="text-sm text-danger">{errors.jars}</p> : null}
        <ol className="space-y-3">
          {jars.map((jar, index) => {
            const row = dosed[index];
            const stockMl = usable && row.dose !== null && row.dose > 0 ? benchStockMillilitres(volume, row.dose, stock) : null;
            const removal = raw !== null && raw > 0 && row.ntu !== null && row.ntu >= 0 ? turbidityRemoval(raw, row.ntu) : null;
            return (
              <li key={index} className="rounded border border-line bg-paper p-2" data-testid={`jar-${index + 1}`}>
                <div className="flex flex-wrap items-baseline justify-between gap-x-3">
                  <h3 className="text-sm font-semibold">Jar {index + 1}</h3>
                  <p className="text-sm" data-testid={`jar-${index + 1}-stock`}>
                    {stockMl !== null ? <>add <span className="figures">{formatFigure(stockMl, 2)} mL</span> of stock</> : null}
                    {removal !== null ? <> · <span className="figures">{formatFigure(removal * 100, 0)} %</span> of the raw turbidity removed</> : null}
                  </p>
                </div>
                <div className="mt-1 grid grid-cols-2 gap-2 sm:grid-cols-3">
                  <FieldInput label="Dose (mg/L)" name={`jar-${index}-dose`} inputMode="decimal" value={jar.dose} onChange={changeJar(index, "dose")} error={errors[`jar-${index}-dose`]} />
                  <FieldInput label="NTU" name={`jar-${index}-ntu`} inputMode="decimal" value={jar.ntu} onChange={changeJar(index, "ntu")} error={errors[`jar-${index}-ntu`]} />
                  <FieldSelect className="col-span-2 sm:col-span-1" label="Clarity" name={`jar-${index}-clarity`} value={jar.clarity} onChange={changeJar(index, "clarity")} error={errors[`jar-${index}-clarity`]}>
                    <option value="">—</option>
                    {JAR_CLARITIES.map((clarity) => <option key={clarity} value={clarity}>{JAR_CLARITY_LABELS[clarity]}</option>)}
                  </FieldSelect>
                </div>
              </li>
            );
          })}
        </ol>
        <div className="flex flex-wrap gap-2">
          <button type="button" className="rounded border border-line bg-panel px-3 py-2 text-sm disabled:opacity-50" disabled={jars.length >= MAX_JARS} onClick={() => setJars((old) => [...old, { dose: "", ntu: "", clarity: "" }])}>Add a jar</button>
          <button type="button" className="rounded border border-line bg-panel px-3 py-2 text-sm disabled:opacity-50" disabled={jars.length <= 1} onClick={() => setJars((old) => old.slice(0, -1))}>Remove the last jar</button>
        </div>
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2 sm:items-start">
        <div>
          <FieldInput label="Dose chosen (mg/L)" name="chosenDose" inputMode="decimal" value={values.chosenDose} onChange={change} error={errors.chosenDose} hint="blank when no jar was good enough" />
          {figures?.clearestAtLowestDose != null ? (
            <p className="mt-1 text-sm" data-testid="clearest-dose">
              Clearest at the lowest dose: <span className="figures">{formatFigure(figures.clearestAtLowestDose, 2)} mg/L</span>{" "}
              <button type="button" className="ml-1 rounded border border-line bg-panel px-2 py-1 text-xs" onClick={() => setValues((old) => ({ ...old, chosenDose: String(figures.clearestAtLowestDose) }))}>Use it</button>
            </p>
          ) : null}
        </div>
        <div>
          <label htmlFor="jar-photo" className="block text-sm font-medium">Photo of the jars</label>
          <input id="jar-photo" name="file" type="file" accept="image/jpeg,image/png,image/webp" aria-describedby="jar-photo-hint" aria-invalid={errors.file ? true : undefined} className="mt-1 block w-full text-base" />
          <p id="jar-photo-hint" className="mt-1 text-xs text-muted">The raw and the dosed jars side by side. JPEG, PNG or WebP, at most {props.photoMaxMegabytes} MB; kept without its camera data.</p>
          {errors.file ? <p className="mt-1 text-sm text-danger">{errors.file}</p> : null}
        </div>
      </div>
      <div>
        <label htmlFor="field-jar-notes" className="block text-sm font-medium">Notes</label>
        <textarea id="field-jar-notes" name="notes" rows={2} className="mt-1 block w-full rounded border border-line bg-panel px-3 py-2 text-base" />
      </div>
      {errors.form ? <p role="alert" className="text-sm text-danger">{errors.form}</p> : null}
      <SubmitButton pendingLabel="Recording…" intent="jar-test" className="w-full py-3 sm:w-auto">Record the jar test</SubmitButton>
    </Form>
  );
}
