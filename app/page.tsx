export default function HomePage() {
  return (
    <main className="mx-auto max-w-3xl p-10">
      <h1 className="text-3xl font-semibold text-river">Tributary</h1>
      <p className="mt-3">Plan marketing budgets on approved regression fits.</p>
    </main>
  );
}
