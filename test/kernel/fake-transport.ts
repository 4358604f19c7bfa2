import { CommManager, type CommTransport } from "../../widgets/core/comm/comm-manager";

/** A CommManager whose messages to the front-end are recorded instead of sent. */
export interface Published {
  msgType: string;
  content: Record<string, unknown>;
  metadata: Record<string, unknown>;
  buffers: readonly Uint8Array[];
}

export function recordingComms(): { comms: CommManager; sent: Published[]; log: string[] } {
  const sent: Published[] = [];
  const log: string[] = [];
  const transport: CommTransport = {
    publish: (msgType, content, metadata, buffers) => sent.push({ msgType, content, metadata, buffers }),
    log: (line) => log.push(line),
  };
  return { comms: new CommManager(transport), sent, log };
}

let counter = 0;
/** A front-end comm_msg to `commId`, as the manager receives it. */
export async function frontEnd(comms: CommManager, commId: string, data: unknown, buffers: Uint8Array[] = []): Promise<string> {
  const msgId = `fe-${++counter}`;
  await comms.handle("comm_msg", { comm_id: commId, data }, {}, buffers, msgId);
  return msgId;
}
