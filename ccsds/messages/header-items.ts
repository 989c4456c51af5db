/** The header block and the leading metadata keywords that OPM and OEM share (502.0-B sections 3.2, 5.2), as render items. */
import type { OdmHeader, OdmMetadata } from './odm-types.ts';
import type { Item } from '../syntax/render.ts';

/**
 * Items from the version keyword (KVN only; XML carries the version as an attribute) to the header's close.
 * `versionKeyword` is CCSDS_OPM_VERS or CCSDS_OEM_VERS.
 */
export function headerItems(versionKeyword: string, header: OdmHeader, encoding: 'kvn' | 'xml'): Item[] {
  const items: Item[] = [];
  const kw = (keyword: string, value: string): void => { items.push({ kind: 'keyword', keyword, value }); };
  if (encoding === 'kvn') kw(versionKeyword, header.version);
  items.push({ kind: 'open', name: 'header' });
  header.comments.forEach((text) => items.push({ kind: 'comment', text }));
  if (header.classification !== undefined) kw('CLASSIFICATION', header.classification);
  kw('CREATION_DATE', header.creationDate);
  kw('ORIGINATOR', header.originator);
  if (header.messageId !== undefined) kw('MESSAGE_ID', header.messageId);
  items.push({ kind: 'close', name: 'header' });
  return items;
}

/** The metadata comments and the five keywords both messages open their metadata with, OBJECT_NAME to TIME_SYSTEM. */
export function metadataLeadItems(metadata: OdmMetadata): Item[] {
  const items: Item[] = metadata.comments.map((text): Item => ({ kind: 'comment', text }));
  const kw = (keyword: string, value: string): void => { items.push({ kind: 'keyword', keyword, value }); };
  kw('OBJECT_NAME', metadata.objectName);
  kw('OBJECT_ID', metadata.objectId);
  kw('CENTER_NAME', metadata.centerName);
  kw('REF_FRAME', metadata.refFrame);
  kw('TIME_SYSTEM', metadata.timeSystem);
  return items;
}
