// Slew-rate limits: each stage with a stated bias current can move its node no faster than I/C, where C
// is the capacitance that current must charge (Allen & Holberg ch. 6: I_tail/Cc for the first stage,
// I/(Cc + CL) for the output stage — from memory). A stage whose node is held near-still by a following
// gain stage through a compensation capacitor (any node other than the output with such a capacitor
// attached) charges only the compensation capacitors; any other node charges everything attached to it.
import type { DesignModel } from '../language/model';
import type { SlewEstimate } from './types';

export function slewEstimate(model: DesignModel): SlewEstimate | undefined {
  const limits: SlewEstimate['limits'][number][] = [];
  for (const st of model.stages) {
    if (st.bias === undefined || !(st.bias > 0)) continue;
    const node = st.name;
    let comp = 0;
    for (const m of model.millers) if (m.from === node || m.to === node) comp += m.cc;
    for (const b of model.buffered) if (b.from === node || b.to === node) comp += b.cc;
    let cap: number;
    if (node !== model.output && comp > 0) cap = comp;
    else {
      cap = comp + st.cap;
      for (const l of model.loads) if (l.node === node && l.cap !== undefined) cap += l.cap;
      for (const e of model.elements) {
        if (e.kind !== 'cap') continue;
        if ((e.a.kind === 'node' && e.a.name === node) || (e.b.kind === 'node' && e.b.name === node))
          cap += e.value;
      }
    }
    if (!(cap > 0)) continue;
    limits.push({ stage: st.name, current: st.bias, cap, rate: st.bias / cap });
  }
  if (limits.length === 0) return undefined;
  return { rate: Math.min(...limits.map((l) => l.rate)), limits };
}
