export function App() {
  return (
    <main>
      <h1>preheard</h1>
      <p>Loading the app…</p>
    </main>
  );
}
