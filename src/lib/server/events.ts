/**
 * Changes in a project, told to everyone looking at it: the viewer's overlay and the boards
 * refresh when someone else records a result or moves a pin. In-process (one server).
 */
import { EventEmitter } from 'node:events';
import { db } from './db';

export type ProjectEvent =
	| {
			type: 'pin';
			action: 'created' | 'moved' | 'reviewed' | 'removed';
			revisionId: number;
			jointId: number;
			pinId: number;
	  }
	| { type: 'joint'; action: 'updated' | 'voided' | 'recorded'; jointId: number; drawingId: number }
	| { type: 'revision'; action: 'added'; drawingId: number; revisionId: number }
	/** A drawing's register data changed (number, title, type, line, area, system). */
	| { type: 'drawing'; action: 'updated'; drawingId: number }
	/** Weld numbers read from a revision's sheets, or suggestions accepted or dismissed. */
	| { type: 'suggestions'; action: 'read' | 'changed'; drawingId: number; revisionId: number }
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

type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];
type Tell = (projectId: number, event: ProjectEvent & { by?: string }) => void;

/**
 * Run a write in one transaction and tell the project's viewers only once it is committed:
 * a viewer that reloads on the news reads the change, and a write that fails tells nobody.
 */
export function afterCommit<T>(work: (tx: Tx, tell: Tell) => T): T {
	const pending: Parameters<Tell>[] = [];
	const result = db.transaction((tx) => work(tx, (...told) => void pending.push(told)));
	for (const [projectId, event] of pending) publish(projectId, event);
	return result;
}
