import { renderCertificatePdf } from '../../src/lib/server/pdf/certificate';
const c = { number: '7K2M-9QXD-4T0B-HWRC', holderName: 'Zoë Ashdown', courseCode: 'TP-200', courseTitle: 'Transition patches', scope: 'Point repairs across one concentric or eccentric change of diameter within DN100-DN300, by a certified point-repair installer.', diameterMinMm: 100, diameterMaxMm: 300, testOn: '2026-11-02', practicalOn: '2026-11-20', issuedOn: '2026-11-20', expiresOn: '2029-11-20', trainers: ['Mira Calloway'], issuerName: 'Fenmoor Training Yard', verifyUrl: 'http://localhost:3018/verify/7K2M-9QXD-4T0B-HWRC', checkUrl: 'localhost:3018/verify', credentialJwt: 'x'.repeat(2500), issuedAt: '2026-11-20T10:00:00Z' };
const wall=[], cpu=[];
for (let i=0;i<30;i++){const t=performance.now(); const u=process.cpuUsage(); await renderCertificatePdf({...c, holderName: 'Person '+i},'a4'); const d=process.cpuUsage(u); wall.push(performance.now()-t); cpu.push((d.user+d.system)/1000);}
const med=(a)=>a.sort((x,y)=>x-y)[a.length>>1];
console.log('wall', med(wall).toFixed(1), 'cpu', med(cpu).toFixed(1));
