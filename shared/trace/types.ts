import type { EngineWarning } from '../errors'

/** What a channel measures, as far as the reader can tell from the signal itself. */
export type ChannelRole = 'transmission' | 'ramp' | 'reflection' | 'unknown'

/** One recorded signal, on the trace's shared time axis. */
export interface TraceChannel {
  /** From the header, or "CH1", "CH2"… when the file has none. */
  name: string
  /** After conversion: 'V' for voltages (mV → V), otherwise what the header says ('' when nothing). */
  unit: string
  /** One value per sample; NaN where a sample was blank, NaN or clipped out. */
  values: Float64Array
  /** Detected role, or the one the caller set through `ReadTraceOptions.roles`. */
  role: ChannelRole
  /** One sentence: why this role was chosen (or "set by the user"). */
  roleEvidence: string
}

/** A whole oscilloscope / DAQ export, read into typed arrays. */
export interface Trace {
  sampleCount: number
  /** Seconds between samples. */
  sampleInterval: number
  /** Seconds: time of sample 0 on the file's own axis. */
  startTime: number
  /** Seconds, the file's own time axis (rebuilt from the interval when printed times were broken). */
  time: Float64Array
  channels: TraceChannel[]
  /** Key/value metadata found in the preamble or per-channel blocks (block keys prefixed by channel). */
  metadata: Record<string, string>
  warnings: EngineWarning[]
}

export interface ReadTraceOptions {
  /** Seconds per sample, for files with no time column and no interval in the header. */
  sampleIntervalSeconds?: number
  /** Largest accepted input in bytes. @default 209715200 (200 MiB) */
  maxBytes?: number
  /** Override detection, keyed by channel name or 0-based channel index ("0", "1", …). */
  roles?: Record<string, ChannelRole>
}
