/**
 * Changes in a project, told to everyone looking at it: the viewer's overlay and the boards
 * refresh when someone else records a result or moves a pin. In-process (one server).
 */
import { EventEmitter } from 'node:events';

export type ProjectEvent =
	| {
			type: 'pin';
			action: 'created' | 'moved' | 'reviewed';
			revisionId: number;
			jointId: number;
			pinId: number;
	  }
	| { type: 'joint'; action: 'updated' | 'voided' | 'recorded'; jointId: number; drawingId: number }
	| { type: 'revision'; action: 'added'; drawingId: number; revisionId: number }
	/** How far the sheets of a revision are prepared as image tiles (src/lib/server/tiles.ts). */
	| {
			type: 'tiles';
			drawingId: number;
			revisionId: number;
			total: number;
			done: number;
			failed: number;
	  };

interface Bus {
	emitter: EventEmitter;
}

const bus = ((globalThis as { tacksheetEvents?: Bus }).tacksheetEvents ??= {
	emitter: new EventEmitter()
});
bus.emitter.setMaxListeners(0);

export function publish(projectId: number, event: ProjectEvent & { by?: string }): void {
	bus.emitter.emit(`project:${projectId}`, { ...event, at: Date.now() });
}

export function subscribe(
	projectId: number,
	listener: (event: ProjectEvent & { at: number; by?: string }) => void
): () => void {
	const name = `project:${projectId}`;
	bus.emitter.on(name, listener);
	return () => bus.emitter.off(name, listener);
}
