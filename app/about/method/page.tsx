import type { Metadata } from 'next';
import Link from 'next/link';

export const metadata: Metadata = { title: 'About the method' };

function Caution({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <aside className="rounded-card border-2 border-amber bg-amber-soft p-4">
      <p className="font-bold text-amber">▲ {title}</p>
      <div className="mt-1 text-ink">{children}</div>
    </aside>
  );
}

export default function MethodPage() {
  return (
    <main id="main" className="mx-auto max-w-3xl px-4 py-10">
      <p className="text-sm font-bold uppercase tracking-wide text-brine">Countersample</p>
      <h1 className="mb-6 text-3xl font-bold">About the method</h1>
      <div className="grid gap-6 leading-relaxed">
        <Caution title="The cryoscope’s coolant is toxic">
          Thermistor cryoscopes cool the sample in a bath or block filled with an ethylene-glycol mixture. Ethylene glycol is
          poisonous if swallowed and harmful to the kidneys: wear gloves and eye protection when topping up or changing it, never
          pipette by mouth, keep it away from food and milk samples, and dispose of it as the safety data sheet and local rules say.
        </Caution>
        <Caution title="A proposal is decision support, not a decision">
          The decision module proposes an outcome and shows every check it made. The arbiter decides, with written reasons, and may
          depart from the proposal. Decisions carry legal and financial weight: local regulations, the supply contract and licensed
          practice prevail over anything this product says.
        </Caution>
        <section>
          <h2 className="mb-2 text-xl font-bold">What the freezing point shows</h2>
          <p>
            Milk freezes a little below 0 °C because of what is dissolved in it; authentic cow’s milk usually freezes between about
            −0.520 °C and −0.530 °C. Water added to milk dilutes it and moves the freezing point up towards 0 °C; added salts or
            other solutes move it down. Breed, feed, season, heat stress and water access move a herd’s own freezing point too, which
            is why an authentic herd sample can settle a dispute.
          </p>
        </section>
        <section>
          <h2 className="mb-2 text-xl font-bold">How it is measured</h2>
          <p>
            The reference method is ISO 5764 | IDF 108: a test portion of about 2.5 ml at 20 ± 2 °C is supercooled in a thermistor
            cryoscope, crystallisation is started mechanically, and the temperature plateau that follows is the freezing point. The
            instrument is calibrated on two sodium chloride standards that bracket milk and checked on a third.
          </p>
          <ul className="mt-2 list-disc pl-6">
            <li>Results are shown in °C with three decimals; differences in m°C (thousandths of a degree).</li>
            <li>Two readings of one sample should agree within the repeatability limit r (4 m°C for bovine milk); otherwise more readings are taken.</li>
            <li>Two laboratories’ results should agree within the critical difference derived from the reproducibility R (6 m°C).</li>
            <li>A retained sample is valid for the test while kept at 0–6 °C, for 48 hours after sampling unless the scheme says otherwise. A frozen sample is no longer valid.</li>
            <li>Early crystallisation usually comes from crystallised fat: warm the sample to about 45 °C for 5 minutes, cool to 20 °C and test at once. No crystallisation at all often points to added salts.</li>
            <li>Results for sour milk (titratable acidity above 20 ml of 0.1 mol/l NaOH per 10 g solids-not-fat) are not representative.</li>
          </ul>
        </section>
        <section>
          <h2 className="mb-2 text-xl font-bold">Added water</h2>
          <p>
            The standard itself does not estimate added water. An estimate compares the sample with an authentic reference measured by
            the same method: added water (%) = (T − T′) / T × 100, with T and T′ the freezing-point depressions of the reference and the
            sample. It is an estimate, sensitive to the chosen reference.
          </p>
        </section>
        <p>
          <Link href="/method/proposal">How a proposal is made: each rule, its formula and its source</Link> (for signed-in members of the scheme).
        </p>
        <p className="text-sm text-brine">
          <Link href="/sign-in">Sign in</Link> · <Link href="/desk">Your desk</Link>
        </p>
      </div>
    </main>
  );
}
