import { estimateBistable } from './catalog/families/bistable-beam/estimate'
import { tableUncertainty } from './catalog/families/bistable-beam/uncertainty'
import { evaluate } from './catalog'
for (const S of [50, 55, 60]) for (const Q of [2.26, 2.28, 2.30, 2.31, 2.32, 2.34, 2.36]) {
  const p = { span: S, apexHeight: Q, thickness: 1, depth: 6, postLength: 0 }
  const e = estimateBistable(p, { modulus: 2000, strainLimit: 0.02 })!
  const x = evaluate('bistable-beam', { ...p, modulus: 2000 }).metrics
  console.log(S, Q, 'table valley', (e.valleyForce as number).toFixed(3), 'exact', (x.valleyForce as number).toFixed(3), e.bistable !== x.bistable ? 'FLIP' : '', tableUncertainty(p)?.join(','))
}
