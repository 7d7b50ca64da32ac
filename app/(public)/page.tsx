import { ButtonLink } from "@/components/ui/button";

const STEPS = [
  { title: "A record for every piece", body: "Species, resin, and every finish layer with the date it went on — kept by the studio that built it." },
  { title: "Care at the right time", body: "Reminders worked out from the finish, how hard the piece is used and how much sun it gets." },
  { title: "Claims without the back-and-forth", body: "Owners send photos from their phone; the studio sees the warranty terms and the care history beside them." },
  { title: "Touch-ups, booked and logged", body: "Quotes, payment and a visit slot; the technician's new coats restart the care clock." },
];

export default function LandingPage() {
  return (
    <div className="mx-auto max-w-6xl px-4">
      <section className="grid gap-8 py-12 sm:py-20 lg:grid-cols-[3fr_2fr] lg:items-center">
        <div className="space-y-6">
          <h1 className="font-display text-4xl font-semibold leading-tight tracking-tight sm:text-5xl">
            Keep every slab, burl and resin pour looking the way it left the shop.
          </h1>
          <p className="max-w-xl text-lg text-muted">
            Grainward is the aftercare desk for studios that build one-off furniture, and the care companion for the people who own it.
          </p>
          <div className="flex flex-wrap gap-3">
            <ButtonLink href="/sign-in">Sign in</ButtonLink>
            <ButtonLink href="/sign-up" variant="secondary">I own a piece</ButtonLink>
            <ButtonLink href="/start" variant="ghost">Start a studio</ButtonLink>
          </div>
        </div>
        <div aria-hidden className="rounded-2xl border border-line bg-card p-6">
          <div className="space-y-2">
            {["Ceramic-type topcoat", "Hardwax oil, 2 coats", "Deep-pour resin", "Black walnut"].map((l, i) => (
              <div key={l} className="rounded-md px-3 py-2 text-sm" style={{ background: ["#e3efed", "#efe4d2", "#d9ecea", "#8a6a4f"][i], color: i === 3 ? "#fff" : undefined }}>
                {l}
              </div>
            ))}
          </div>
          <p className="mt-3 text-xs text-muted">A finish stack, newest layer on top.</p>
        </div>
      </section>
      <section aria-labelledby="how" className="pb-8">
        <h2 id="how" className="sr-only">What it does</h2>
        <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          {STEPS.map((s) => (
            <li key={s.title} className="rounded-xl border border-line bg-card p-5">
              <h3 className="font-semibold">{s.title}</h3>
              <p className="mt-2 text-sm text-muted">{s.body}</p>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
