import { median } from '../../numbers'
import type { SpectrumPeak } from '../readSpectrum'

/**
 * Candidate periods: spacings between resonances that look alike, grouped within 3 %, each scored by the share of
 * resonance height that finds its like one period later (linkFamilies follows the local period of a nonlinear
 * sweep). A multiple of the period scores as well as the period itself (every family repeats at 2P too): the
 * shortest period within 15 % of the best score comes first.
 */
export function periodCandidates(peaks: SpectrumPeak[], order: number[], sigmaV: number, width: number, endSeconds: number): { seconds: number; score: number }[] {
  const strong = order.filter((i) => peaks[i].heightV >= 6 * sigmaV)
  const top = strong.slice().sort((a, b) => peaks[b].heightV - peaks[a].heightV).slice(0, 30)
  const spacings: number[] = []
  for (let x = 0; x < top.length; x++) {
    for (let y = 0; y < top.length; y++) {
      const a = peaks[top[x]]
      const b = peaks[top[y]]
      const d = b.tSeconds - a.tSeconds
      if (d > 20 * width && alike(a.heightV, b.heightV, sigmaV)) spacings.push(d)
    }
  }
  spacings.sort((a, b) => a - b)
  const groups: number[][] = []
  for (const d of spacings) {
    const last = groups[groups.length - 1]
    if (last && d <= last[0] * 1.03) last.push(d)
    else groups.push([d])
  }
  const scored = groups.slice(0, 40).map((g) => {
    const seconds = median(g)
    const links = linkFamilies(peaks, strong, seconds, sigmaV, width)
    return { seconds, score: periodicity(peaks, strong, links, endSeconds) }
  })
  const best = Math.max(0, ...scored.map((c) => c.score))
  scored.sort((a, b) => {
    const goodA = a.score >= 0.85 * best
    const goodB = b.score >= 0.85 * best
    if (goodA !== goodB) return goodA ? -1 : 1
    return goodA ? a.seconds - b.seconds : b.score - a.score
  })
  return scored
}

/** Share of the height of resonances with room for a repeat (by the links' local period) that are linked to one. */
function periodicity(peaks: SpectrumPeak[], strong: number[], links: Link[], endSeconds: number): number {
  if (links.length === 0) return 0
  const spacing = median(links.map((l) => peaks[l.to].tSeconds - peaks[l.from].tSeconds))
  const linked = new Map(links.map((l) => [l.from, l.weight]))
  let matched = 0
  let eligible = 0
  for (const i of strong) {
    const p = peaks[i]
    const room = p.tSeconds + 0.97 * spacing <= endSeconds
    if (!room && !linked.has(i)) continue
    eligible += p.heightV
    matched += linked.get(i) ?? 0
  }
  return eligible > 0 ? (matched / eligible) * Math.min(1, links.length / 2) : 0
}

export interface Link {
  from: number
  to: number
  weight: number
}

/**
 * Links each resonance to its like one period later. The local period is followed: a first pass within 15 % of the
 * period gives the period's slow change along the sweep (a straight line in time, weighted by height), and the
 * second pass links within 4 % of that local period (or three linewidths).
 */
export function linkFamilies(peaks: SpectrumPeak[], order: number[], period: number, sigmaV: number, width: number, relative = 0.25): Link[] {
  let local = (_t: number) => period
  let links: Link[] = []
  for (const tolerance of [0.15, 0.06, 0.04]) {
    links = []
    const taken = new Set<number>()
    const candidates: Link[] = []
    for (const i of order) {
      const p = peaks[i]
      const expected = local(p.tSeconds)
      let best: Link | null = null
      let bestCost = Infinity
      for (const j of order) {
        const q = peaks[j]
        const d = q.tSeconds - p.tSeconds - expected
        if (Math.abs(d) > Math.max(tolerance * expected, 3 * width) || !alike(p.heightV, q.heightV, sigmaV, relative)) continue
        const cost = Math.abs(d) / expected + Math.abs(p.heightV - q.heightV) / Math.max(p.heightV, q.heightV)
        if (cost < bestCost) {
          bestCost = cost
          best = { from: i, to: j, weight: Math.min(p.heightV, q.heightV) }
        }
      }
      if (best) candidates.push(best)
    }
    // Each resonance has at most one predecessor: the tallest link into it wins.
    candidates.sort((a, b) => b.weight - a.weight)
    for (const l of candidates) {
      if (taken.has(l.to)) continue
      taken.add(l.to)
      links.push(l)
    }
    if (links.length === 0) return []
    // Local period: weighted straight line through the links' spacings against their mid times.
    let sw = 0
    let st = 0
    let sd = 0
    let stt = 0
    let std = 0
    for (const l of links) {
      const t = (peaks[l.from].tSeconds + peaks[l.to].tSeconds) / 2
      const d = peaks[l.to].tSeconds - peaks[l.from].tSeconds
      sw += l.weight
      st += l.weight * t
      sd += l.weight * d
      stt += l.weight * t * t
      std += l.weight * t * d
    }
    const tm = st / sw
    const dm = sd / sw
    const varT = stt / sw - tm * tm
    const slope = varT > 0 && links.length >= 3 ? (std / sw - tm * dm) / varT : 0
    local = (t: number) => Math.max(0.5 * dm, dm + slope * (t + dm / 2 - tm))
  }
  return links
}

/** Chains of linked resonances (one family, one member per FSR): each a list of peak indices in time order. */
export function chainsFrom(links: Link[], count: number): number[][] {
  const next = new Map<number, number>()
  const hasPrevious = new Set<number>()
  for (const l of links) {
    next.set(l.from, l.to)
    hasPrevious.add(l.to)
  }
  const chains: number[][] = []
  for (let i = 0; i < count; i++) {
    if (hasPrevious.has(i) || !next.has(i)) continue
    const chain = [i]
    let k = i
    while (next.has(k)) {
      k = next.get(k)!
      chain.push(k)
    }
    chains.push(chain)
  }
  return chains
}

/** Two resonances look alike when their heights differ by less than a quarter of the taller plus 4σ (drift, noise). */
export function alike(a: number, b: number, sigmaV: number, relative = 0.25): boolean {
  return Math.abs(a - b) <= relative * Math.max(a, b) + 4 * sigmaV
}
