import { CautionBox } from '@/components/ui/caution-box';

/** Where limits are explained: model Food Code values, local rules decide. */
export function HoldingCaution() {
  return (
    <CautionBox title="These limits are model values">
      <p>
        The limits here follow the FDA Food Code 2022 model: time as a public health control 4 hours (3-501.19(B)) or 6 hours for cold food that
        stays at 70 °F (21 °C) or below (3-501.19(C)), and cooling from 135 °F to 70 °F within 2 hours and to 41 °F within 6 hours in all (3-501.14).
      </p>
      <p>States and counties adopt the Food Code with changes. Your local rules and your local health authority decide; when in doubt, throw it out.</p>
    </CautionBox>
  );
}
