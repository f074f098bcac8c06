import { it } from 'vitest';
import { testApp } from './helpers.ts';
it('exp', async () => {
  const t = await testApp();
  const body = Buffer.from('--XYZ\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\nContent-Type: application/octet-stream\r\n\r\nhello world');
  const cases: Array<[string, Buffer]> = [
    ['multipart/form-data', body],
    ['multipart/form-data; boundary=OTHER', Buffer.concat([body, Buffer.from('\r\n--XYZ--\r\n')])],
    ['multipart/form-data; boundary=XYZ', body],
    ['multipart/form-data; boundary=XYZ', Buffer.from('')],
  ];
  for (const [ct, b] of cases) {
    const res = await t.http().post('/v1/images').set('content-type', ct).send(b);
    console.log(ct, res.status, res.text);
  }
  console.log(t.logs.filter((l) => l.includes('"level":50')).map((l) => l.slice(0, 600)).join('\n'));
  await t.close();
});
