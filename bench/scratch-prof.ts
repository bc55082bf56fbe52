import { quadraticFluxUnchecked, quadraticFluxPartialsUnchecked } from '../packages/models/src/transit/quadraticFlux.js';
const M = 20000; let sink=0;
const cpu=()=>{const u=process.cpuUsage(); return (u.user+u.system)/1e6;};
function t(name:string, f:()=>void){ for(let r=0;r<30;r++) f(); let best=1e9; for(let r=0;r<40;r++){const s=cpu(); for (let q=0;q<5;q++) f(); best=Math.min(best,(cpu()-s)/5);} console.log(name, (best*1e9/M).toFixed(1),'ns'); }
const zs = Float64Array.from({length:M},(_, i)=>(1.1*i)/M);
const zin = Float64Array.from({length:M},(_, i)=>(0.85*i)/M);
const zcr = Float64Array.from({length:M},(_, i)=>0.92+(0.17*i)/M);
const f5=new Float64Array(5);
t('empty', ()=>{for(let i=0;i<M;i++){sink+=zs[i]*1.0001;}});
t('flux value', ()=>{for(let i=0;i<M;i++){sink+=quadraticFluxUnchecked(zs[i],0.1,0.42,0.21);}});
t('flux value inside', ()=>{for(let i=0;i<M;i++){sink+=quadraticFluxUnchecked(zin[i],0.1,0.42,0.21);}});
t('flux value crossing', ()=>{for(let i=0;i<M;i++){sink+=quadraticFluxUnchecked(zcr[i],0.1,0.42,0.21);}});
t('flux partials', ()=>{for(let i=0;i<M;i++){sink+=quadraticFluxPartialsUnchecked(zs[i],0.1,0.42,0.21,f5,0);}});
console.log(sink>0);
