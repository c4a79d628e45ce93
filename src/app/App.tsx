export function App() {
  return (
    <main className="shell">
      <h1>Blendbench</h1>
      <p>Gear-oil reformulation workbench.</p>
      <p className="caution" role="note">
        Predicted properties are estimates. Every blend requires laboratory confirmation before release;
        the safety data sheets, site procedures and local regulations govern handling.
      </p>
    </main>
  );
}
