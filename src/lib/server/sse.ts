// Server-Sent Events plumbing shared by the live streams (the Floor's running log, a job's log).

export interface EventSink {
	/** Writes raw event-stream text; a no-op once the stream has closed. */
	write(text: string): void;
	/** Ends the stream (the browser reconnects by itself after `retry`). */
	close(): void;
}

/**
 * A text/event-stream response. `start` wires its sources to the sink and returns their
 * teardown, which runs once, whether the server or the browser ends the stream. A comment line
 * every `heartbeatMs` keeps proxies from closing an idle connection.
 */
export function eventStream(
	start: (sink: EventSink) => () => void,
	heartbeatMs = 15_000
): Response {
	const encoder = new TextEncoder();
	let cleanup = () => {};
	const stream = new ReadableStream<Uint8Array>({
		start(controller) {
			let open = true;
			let teardown = () => {};
			const sink: EventSink = {
				write(text) {
					if (!open) return;
					try {
						controller.enqueue(encoder.encode(text));
					} catch {
						sink.close();
					}
				},
				close() {
					if (!open) return;
					open = false;
					clearInterval(heartbeat);
					teardown();
					try {
						controller.close();
					} catch {
						// already closed by the client
					}
				}
			};
			const heartbeat = setInterval(() => sink.write(': keep-alive\n\n'), heartbeatMs);
			cleanup = sink.close;
			teardown = start(sink);
		},
		cancel() {
			cleanup();
		}
	});
	return new Response(stream, {
		headers: {
			'content-type': 'text/event-stream; charset=utf-8',
			'cache-control': 'no-cache, no-transform',
			'x-accel-buffering': 'no'
		}
	});
}
