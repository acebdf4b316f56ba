import type { SheetDocument } from '@shared/sheet/document';
import type { SheetFeatures } from './sheets/sheet-features';

/**
 * The demo research group, our own invention: the owner of the fish-stock sheet shares it with
 * an editor and a commenter; the editor forks it to try a noisier environment; there are comment
 * threads (one on a chart, one resolved) and an invitation still waiting for an answer.
 */
export const DEMO_INVITEE = 'joaquim.reyes@example.test';

interface Member {
  id: string;
  email: string;
}

export interface DemoGroup {
  owner: Member;
  editor: Member;
  commenter: Member;
}

function withVolatility(document: unknown, sigma: number): SheetDocument {
  const source = document as SheetDocument;
  return {
    ...source,
    cells: source.cells.map((cell) =>
      cell.kind === 'params'
        ? {
            ...cell,
            params: cell.params.map((param) => (param.name === 'sigma' ? { ...param, value: sigma } : param)),
          }
        : cell,
    ),
  };
}

const firstCellOf = (document: unknown, kind: SheetDocument['cells'][number]['kind']) =>
  (document as SheetDocument).cells.find((cell) => cell.kind === kind)?.id;

/** Shares, a fork, comments and a pending invitation on `sheetId` (the owner's sheet). */
export async function seedDemoGroup(
  features: SheetFeatures,
  group: DemoGroup,
  sheetId: string,
  origin: string,
): Promise<{ forkId: string }> {
  const { shares, forks, sheets, comments } = features;
  await shares.share(group.owner, sheetId, { email: group.editor.email, role: 'editor' }, origin);
  await shares.share(group.owner, sheetId, { email: group.commenter.email, role: 'commenter' }, origin);

  const source = await sheets.getSheet(group.owner, sheetId);
  const fork = await forks.forkSheet(group.editor, sheetId, {
    title: `${source.title} (noisier years)`.slice(0, 200),
  });
  await sheets.saveVersion(group.editor, fork.id, {
    baseVersion: 1,
    message: 'Environmental noise 0.40 → 0.55: what if recruitment swings harder?',
    document: withVolatility(source.document, 0.55),
  });

  const chartCell = firstCellOf(source.document, 'chart');
  const paramsCell = firstCellOf(source.document, 'params');
  if (chartCell) {
    const thread = await comments.createComment(
      group.commenter,
      sheetId,
      {
        cellId: chartCell,
        version: source.version,
        body: 'The fan widens fast after year 10. Is that the **absorbing** boundary at work, or just the noise?',
      },
      origin,
    );
    await comments.createComment(
      group.owner,
      sheetId,
      {
        cellId: chartCell,
        version: source.version,
        body: 'Mostly the noise: absorbed paths stay at the boundary. The collapse probe counts them separately.',
        parentId: thread.id,
      },
      origin,
    );
  }
  if (paramsCell) {
    const thread = await comments.createComment(
      group.editor,
      sheetId,
      {
        cellId: paramsCell,
        version: source.version,
        body: 'Should the harvest rate carry a unit of 1/yr? The landings report gives it per season.',
      },
      origin,
    );
    await comments.updateComment(group.owner, thread.id, { resolved: true });
  }

  await shares.share(group.owner, sheetId, { email: DEMO_INVITEE, role: 'viewer' }, origin);
  return { forkId: fork.id };
}
