import { PGlite } from '@electric-sql/pglite';
let t=performance.now();
const a = new PGlite(); await a.waitReady; console.log('first', performance.now()-t);
t=performance.now(); const b = new PGlite(); await b.waitReady; console.log('second', performance.now()-t);
await a.exec('create table x(id int primary key); insert into x values (1)');
t=performance.now(); const c = await a.clone(); console.log('clone', performance.now()-t, (await c.query('select * from x')).rows);
t=performance.now(); const d = await a.clone(); console.log('clone2', performance.now()-t);
t=performance.now(); const dump = await a.dumpDataDir('none'); console.log('dump', performance.now()-t, dump.size);
t=performance.now(); const e = new PGlite({loadDataDir: dump}); await e.waitReady; console.log('load', performance.now()-t, (await e.query('select * from x')).rows);
