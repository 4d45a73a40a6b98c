// Messages between the page and the render Worker (render.worker.ts).
import type { SpeakerSystem } from '../engine/system.ts';
import type { DesignLevel, DesignRender, ExportStream } from './jobs.ts';
import type { DesignSlot } from './protocol.ts';
import type { ExportFormat } from './wav-export.ts';

export type WorkerRequest =
  | { type: 'track'; channels: Float32Array[]; sampleRate: number }
  | { type: 'levels'; id: number; systems: Record<DesignSlot, SpeakerSystem> }
  | { type: 'render'; id: number; systems: Record<DesignSlot, SpeakerSystem> }
  | { type: 'export'; id: number; system: SpeakerSystem; mode: ExportStream; format: ExportFormat };

export type WorkerReply =
  | { type: 'progress'; id: number; fraction: number }
  | { type: 'levels'; id: number; levels: Record<DesignSlot, DesignLevel> }
  | { type: 'rendered'; id: number; results: Record<DesignSlot, DesignRender> }
  | { type: 'exported'; id: number; bytes: Uint8Array; frames: number; sampleRate: number }
  | { type: 'error'; id: number; message: string };
