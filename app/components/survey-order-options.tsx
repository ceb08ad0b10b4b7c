import { SURVEY_ORDER_NAMES, TVU_COEFFICIENTS, SURVEY_ORDERS } from "../../shared/qa/tvu";

/**
 * The IHO S-44 orders as a select's options, each with the coefficients of its allowed total
 * vertical uncertainty, TVU = √(a² + (b·d)²) (one list for the settings page and the import form).
 */
export function SurveyOrderOptions() {
  return (
    <>
      {SURVEY_ORDERS.map((order) => (
        <option key={order} value={order}>
          {SURVEY_ORDER_NAMES[order]} (a {TVU_COEFFICIENTS[order].aM} m, b {TVU_COEFFICIENTS[order].b})
        </option>
      ))}
    </>
  );
}
