package method
import ("testing";"fmt";"math/rand/v2")
func TestCapQuick(t *testing.T){
 r:=rand.New(rand.NewPCG(1,2))
 x:=make([]float64,500)
 for i:=range x { x[i]= 3+ r.ExpFloat64()*2 }
 res:=FitDistributions(x,0.95)
 for _,c:=range res.Candidates { fmt.Printf("%-12s %v %s k=%d %+v ll=%.4f aic=%.3f ad=%.4f p=%.4f %v q=%.4f %.4f %.4f\n", c.Family,c.Valid,c.Reason,c.NParams,c.Params,c.LogLik,c.AIC,c.AD,c.ADPValue,c.Adequate,c.Q00135,c.Q50,c.Q99865)}
 fmt.Println(res.Chosen,res.Reason,res.LowestAIC, res.Empirical)
}
