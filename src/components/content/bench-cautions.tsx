/** The bench cautions every role sees. Local lab rules always come first; these are the usual ones. */
export function BenchCautions() {
  return (
    <div className="space-y-3 text-body text-ink-700">
      <p className="font-semibold text-caution-700">Your lab's own safety rules and its safety officer come first. These are reminders, not a substitute.</p>
      <div>
        <h3 className="font-bold text-ink-800">RF power into instrument inputs</h3>
        <ul className="mt-1 list-disc space-y-1 pl-5">
          <li>Know the maximum safe input level of every analyzer, oscilloscope and network-analyzer port before you connect a source; the damage level is printed beside the connector and in the manual.</li>
          <li>Start with the source's RF output off and its level at minimum; add an attenuator in front of the input when in doubt and raise the level step by step.</li>
          <li>Mind DC on RF lines: use a DC block where a bias tee or the chip can put a voltage on an input.</li>
        </ul>
      </div>
      <div>
        <h3 className="font-bold text-ink-800">ESD at the probe station</h3>
        <ul className="mt-1 list-disc space-y-1 pl-5">
          <li>Wear a grounded wrist strap and work on the dissipative mat before you touch a wafer, a die, a probe or a board.</li>
          <li>Lift the probes before you move the chuck or change the wafer; land them with supplies and RF off.</li>
          <li>Carry dies and boards in conductive containers only.</li>
        </ul>
      </div>
    </div>
  );
}
