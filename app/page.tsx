import Link from "next/link";
import { Logo } from "@/components/ui/logo";
import { SiteFooter } from "@/components/ui/site-footer";

const steps = [
  {
    title: "Design to a target",
    body: "Enter a Colpitts, Hartley, Clapp or plain tank with part values and tolerances. Tankbook predicts f0, the worst-case and statistical bands, the feedback fraction and the gain the amplifier needs to start.",
  },
  {
    title: "Log every build and tweak",
    body: "Each breadboard, perfboard or PCB build keeps its as-built values. Swap a capacitor, shorten a lead, move the probe ground: the tweak is logged and the prediction follows it.",
  },
  {
    title: "Drop in the capture",
    body: "Upload the oscilloscope CSV after each tweak. Frequency to the limit the record allows, with its uncertainty; amplitude; harmonics in dBc; THD, SINAD and SFDR; and plain warnings when the capture cannot be trusted.",
  },
  {
    title: "See why it is off",
    body: "Measured against predicted, run after run: the drift in ppm, the equivalent extra tank capacitance that explains it, and the single standard-value change that lands the next build on target.",
  },
];

export default function LandingPage() {
  return (
    <>
      <header className="border-b border-rule bg-paper-raised">
        <div className="mx-auto flex max-w-6xl items-center justify-between px-gutter py-3">
          <Logo />
          <Link
            href="/sign-in"
            className="rounded-md border border-copper bg-copper px-3 py-1.5 text-sm font-medium text-white hover:bg-copper-dark"
          >
            Sign in
          </Link>
        </div>
      </header>
      <main className="mx-auto w-full max-w-6xl flex-1 px-gutter py-12">
        <section className="max-w-3xl">
          <p className="text-sm font-medium uppercase tracking-wider text-copper">For RF and analog bench work</p>
          <h1 className="mt-2 text-3xl font-semibold tracking-tight sm:text-4xl">
            The logbook for LC oscillator builds: is it on frequency, is it clean, and why not?
          </h1>
          <p className="mt-4 text-lg text-ink-soft">
            Tankbook keeps every build, tweak and scope capture of your team in one place, analyses each capture the
            moment it lands, compares it with what the part values predict, and flags the builds that break their spec.
          </p>
        </section>
        <ol className="mt-10 grid gap-4 sm:grid-cols-2">
          {steps.map((s, i) => (
            <li key={s.title} className="rounded-lg border border-rule bg-paper-raised p-5">
              <p className="num font-mono text-xs text-ink-faint">Step {i + 1}</p>
              <h2 className="mt-1 font-semibold">{s.title}</h2>
              <p className="mt-2 text-sm text-ink-soft">{s.body}</p>
            </li>
          ))}
        </ol>
        <p className="mt-10 text-sm text-ink-soft">
          Accounts are created by your lab&apos;s Tankbook admin. Ask them for an invitation, or{" "}
          <Link href="/sign-in" className="font-medium text-copper underline underline-offset-2">
            sign in
          </Link>{" "}
          if you have one.
        </p>
      </main>
      <SiteFooter />
    </>
  );
}
