/** Referral questions as offered on every form (ids from lib/interpret's REFERRAL_QUESTIONS). */
export const REFERRALS: [string, string][] = [
  ["general", "General / unexplained breathlessness"],
  ["heart-failure", "Heart failure assessment"],
  ["pre-operative", "Pre-operative risk"],
  ["lung-resection", "Lung resection work-up"],
  ["pulmonary-hypertension", "Pulmonary hypertension"],
  ["transplant", "Heart transplant listing"],
  ["training", "Training prescription"],
];

/** The ergometer and referral-question selects shared by the upload and column-review forms. */
export function ErgometerReferralFields({ values, labelClassName }: { values: Record<string, string>; labelClassName?: string }) {
  return (
    <>
      <label className={labelClassName}>
        Ergometer
        <select name="ergometer" defaultValue={values.ergometer ?? "cycle"}>
          <option value="cycle">cycle</option>
          <option value="treadmill">treadmill</option>
        </select>
      </label>
      <label className={labelClassName}>
        Referral question
        <select name="referral" defaultValue={values.referral ?? "general"}>
          {REFERRALS.map(([value, text]) => (
            <option key={value} value={value}>
              {text}
            </option>
          ))}
        </select>
      </label>
    </>
  );
}
