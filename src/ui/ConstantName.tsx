/** A constant's name as the trade writes it (D<sub>JK</sub>″, ν₀, ζ), from its file key ("upper.DJK"). */
import { constantNameParts } from '../io/constantName';

export function ConstantName({ constantKey }: { constantKey: string }) {
  const p = constantNameParts(constantKey);
  return (
    <span className="constant-name">
      {p.symbol}
      {p.subscript && <sub>{p.subscript}</sub>}
      {p.prime}
      {p.owner && <span className="muted"> ({p.owner})</span>}
    </span>
  );
}
