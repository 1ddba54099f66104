// Shown while the Register's filter lists load.
export default function RegisterLoading() {
  return (
    <div className="flex flex-col gap-4" aria-busy="true">
      <h1 className="text-2xl font-bold">Register</h1>
      <p role="status">Loading the register …</p>
    </div>
  );
}
