/** A figure in mono digits with its unit in the text face (mono units space out oddly: "mm³/s"). */
export function Quantity({ value, unit }: { value: string; unit?: string }) {
  return (
    <>
      <span className="font-mono tabular-nums">{value}</span>
      {unit ? <span className="font-sans"> {unit}</span> : null}
    </>
  );
}
